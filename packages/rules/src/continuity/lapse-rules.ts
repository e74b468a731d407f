// How each code derives lapsesOn — the first day a welder may no longer weld with the process — from the
// last counted evidence (TRADE.md §6). Kept as data so the API's set-based SQL can compute the same date;
// `sql` is the PostgreSQL expression, with :last the last counted evidence and :lastTest the latest
// counted passing test (or the qualification test). PostgreSQL's `date + interval 'n months'` clamps at
// month end exactly as addMonths does here (Aug 31 + 6 months = Feb 28/29).
import { type CodeId } from '../schemas/common.js';
import {
  DEFAULT_CFR_MONTH_COUNTING,
  DEFAULT_ISO_REVALIDATION,
  type CfrMonthCounting,
  type IsoRevalidation,
} from '../schemas/continuity.js';
import { addDays, addMonths, firstOfMonthAfter, minDate, type IsoDate } from './calendar.js';

export type LapseRule = {
  code: CodeId;
  clause: string;
  /** How sure we are: 'from memory: …' or 'regulation: …'. */
  source: string;
  /** What the code says, in our words. */
  wording: string;
  /** lapsesOn = (fromMonthStart ? first day of the month of last : last) + months (clamped) + days. */
  months: number;
  days: number;
  fromMonthStart: boolean;
  /** ISO 9606-1: also lapses this many months after the latest counted test; null = no revalidation date. */
  revalidationMonths: number | null;
  sql: string;
  text: string;
};

export type LapseOptions = { isoRevalidation?: IsoRevalidation; cfrMonthCounting?: CfrMonthCounting };

const asmeIx: LapseRule = {
  code: 'asme-ix',
  clause: 'QW-322.1(a)',
  source: 'from memory: QW-322.1(a)',
  wording:
    'Qualifications for a process expire when the welder has not welded with that process for 6 months or more.',
  months: 6,
  days: 0,
  fromMonthStart: false,
  revalidationMonths: null,
  sql: "(:last::date + interval '6 months')::date",
  text: 'Lapses on the day six calendar months after the last counted evidence.',
};

const awsD11: LapseRule = {
  code: 'aws-d1.1',
  clause: 'AWS D1.1 4.2.3.1 (2015; 6.2.3.1 area in 2020)',
  source: 'from memory: AWS D1.1 4.2.3.1 (2015), 6.2.3.1 area (2020)',
  wording:
    'Remains in effect unless the welder is not engaged in the process for a period exceeding six months.',
  months: 6,
  days: 1,
  fromMonthStart: false,
  revalidationMonths: null,
  sql: "(:last::date + interval '6 months' + interval '1 day')::date",
  text: 'Lapses on the day after the date six calendar months after the last counted evidence.',
};

const api1104WholeMonths: LapseRule = {
  code: 'api-1104',
  clause: '49 CFR 192.229(b)',
  source: 'regulation: 49 CFR 192.229(b)',
  wording:
    'No welder may weld with a process unless, within the preceding 6 calendar months, the welder was engaged in welding with that process (API 1104 itself has no continuity rule).',
  months: 7,
  days: 0,
  fromMonthStart: true,
  revalidationMonths: null,
  sql: "(date_trunc('month', :last::date) + interval '7 months')::date",
  text: 'Counted in whole calendar months (Beadroll default): use in January counts through July 31, so it lapses on August 1.',
};

const api1104SameDay: LapseRule = {
  ...api1104WholeMonths,
  months: 6,
  fromMonthStart: false,
  sql: "(:last::date + interval '6 months')::date",
  text: 'Counted from the date (chosen setting): lapses on the day six calendar months after the last counted evidence.',
};

const isoBase: Omit<LapseRule, 'revalidationMonths' | 'sql' | 'text'> = {
  code: 'iso-9606-1',
  clause: 'ISO 9606-1 9.2, 9.3',
  source: 'from memory: ISO 9606-1 9.2, 9.3',
  wording:
    'Validity is confirmed every six months by the welding coordinator or examiner; the qualification is revalidated by retest every 3 years (9.3 a), every 2 years with production welds tested (9.3 b), or stays valid while confirmed under a verified quality system (9.3 c).',
  months: 6,
  days: 0,
  fromMonthStart: false,
};

const isoRules: Record<IsoRevalidation, LapseRule> = {
  '9.3a': {
    ...isoBase,
    revalidationMonths: 36,
    sql: "least((:last::date + interval '6 months')::date, (:lastTest::date + interval '3 years')::date)",
    text: 'Option 9.3 a (Beadroll default): the earlier of six months after the last confirmation and three years after the latest test.',
  },
  '9.3b': {
    ...isoBase,
    revalidationMonths: 24,
    sql: "least((:last::date + interval '6 months')::date, (:lastTest::date + interval '2 years')::date)",
    text: 'Option 9.3 b: the earlier of six months after the last confirmation and two years after the latest test (production welds tested in the last six months of each period).',
  },
  '9.3c': {
    ...isoBase,
    revalidationMonths: null,
    sql: "(:last::date + interval '6 months')::date",
    text: 'Option 9.3 c: six months after the last confirmation; no revalidation date while confirmed under a verified quality system.',
  },
};

/** The lapse rule of a code with the chosen options (defaults: ISO 9606-1 9.3 a; CFR whole months). */
export function lapseRuleFor(code: CodeId, options: LapseOptions = {}): LapseRule {
  switch (code) {
    case 'asme-ix':
      return asmeIx;
    case 'aws-d1.1':
      return awsD11;
    case 'api-1104':
      return (options.cfrMonthCounting ?? DEFAULT_CFR_MONTH_COUNTING) === 'same-day'
        ? api1104SameDay
        : api1104WholeMonths;
    case 'iso-9606-1':
      return isoRules[options.isoRevalidation ?? DEFAULT_ISO_REVALIDATION];
  }
}

/** Every code's default lapse rule, for the API's SQL and for the README. */
export const lapseRules: Record<CodeId, LapseRule> = {
  'asme-ix': asmeIx,
  'aws-d1.1': awsD11,
  'api-1104': api1104WholeMonths,
  'iso-9606-1': isoRules[DEFAULT_ISO_REVALIDATION],
};

/** lapsesOn from the last counted evidence (and, for ISO 9606-1, the latest counted test). */
export function lapsesOnFor(rule: LapseRule, last: IsoDate, lastTest: IsoDate = last): IsoDate {
  const base = rule.fromMonthStart ? firstOfMonthAfter(last, rule.months) : addMonths(last, rule.months);
  const fromUse = rule.days === 0 ? base : addDays(base, rule.days);
  return rule.revalidationMonths === null
    ? fromUse
    : minDate(fromUse, addMonths(lastTest, rule.revalidationMonths));
}
