// How Beadroll documents print values: ranges with their open ends in words (each end in the unit the
// coupon was recorded in, through the rules package's formatLength), dates that read the same on both sides of the Atlantic.
import { formatLength, type Interval } from '@beadroll/rules';
import { format, parseISO } from 'date-fns';
import type {
  CodeId,
  CriteriaId,
  IsoDate,
  QualificationState,
  QualifiedRangesData,
  WeldingPosition,
} from './document-data.js';

export const CODE_NAMES: Record<CodeId, string> = {
  'asme-ix': 'ASME IX',
  'aws-d1.1': 'AWS D1.1',
  'api-1104': 'API 1104',
  'iso-9606-1': 'ISO 9606-1',
};

const CRITERIA_NAMES: Record<CriteriaId, string> = {
  ...CODE_NAMES,
  'shop-general': 'Shop general (in-house)',
};

export const criteriaName = (id: string): string => CRITERIA_NAMES[id as CriteriaId] ?? id;

export const STATE_WORDS: Record<QualificationState, string> = {
  current: 'Current',
  lapsing: 'Lapsing',
  lapsed: 'Lapsed',
  revoked: 'Revoked',
};

/** '14 Mar 2025': the month in words, so 03/04 is never read two ways. */
export function formatDate(date: IsoDate): string {
  const d = parseISO(date);
  if (Number.isNaN(d.getTime())) throw new RangeError(`"${date}" is not a date (YYYY-MM-DD)`);
  return format(d, 'd MMM yyyy');
}

function interval(range: Interval, what: string, suffix = ''): string {
  const min = range.min ? formatLength(range.min) + suffix : null;
  const max = range.max ? formatLength(range.max) + suffix : null;
  if (min && max) return `${min} to ${max}`;
  if (min) return range.minExclusive ? `over ${min}` : `${min} and over`;
  if (max) return range.maxExclusive ? `under ${max}` : `up to ${max}`;
  return `any ${what}`;
}

/** '3/16 in to 3/4 in', '1/2 in and over', 'under 0.188 in', 'any thickness'. */
export const formatThicknessRange = (r: QualifiedRangesData): string => interval(r.thickness, 'thickness');

/** '1 in OD and over', 'any diameter'. */
export const formatDiameterRange = (r: QualifiedRangesData): string =>
  interval(r.diameter, 'diameter', ' OD');

const ALL: WeldingPosition[] = ['F', 'H', 'V', 'O'];

/** 'F, H, V, O (all)', 'F, H', 'none'. */
export function formatPositions(positions: WeldingPosition[]): string {
  if (positions.length === 0) return 'none';
  const list = ALL.filter((p) => positions.includes(p)).join(', ');
  return ALL.every((p) => positions.includes(p)) ? `${list} (all)` : list;
}

/** 'F-No. 1, 2, 3, 4', 'none'. */
export const formatFNumbers = (fNumbers: number[]): string =>
  fNumbers.length === 0 ? 'none' : `F-No. ${[...fNumbers].sort((a, b) => a - b).join(', ')}`;
