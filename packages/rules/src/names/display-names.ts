// The trade's names for Beadroll's internal ids: what a screen, a PDF, an e-mail or a rules message shows
// instead of 'asme-ix' or '49cfr-192.229c'. One map for every app, so the words never drift apart.
import { type CodeId, type CriteriaId } from '../schemas/common.js';
import { type EvaluationPart, type IndicationType, type VisualFindingType } from '../schemas/examination.js';
import { type Process, processNames } from '../schemas/coupon.js';
import {
  type CfrMonthCounting,
  type ContinuityProfileId,
  type EvidenceKind,
  type IsoRevalidation,
} from '../schemas/continuity.js';
import { type LimitSource } from '../ranges/position-tables.js';

export const codeNames: Record<CodeId, string> = {
  'asme-ix': 'ASME IX',
  'aws-d1.1': 'AWS D1.1',
  'api-1104': 'API 1104',
  'iso-9606-1': 'ISO 9606-1',
};

/** Acceptance criteria sets: a code's own, or the in-house set applied in addition. */
export const criteriaNames: Record<CriteriaId, string> = {
  ...codeNames,
  'shop-general': 'Shop practice (in-house)',
};

/** Processes are named by their trade abbreviation; the long name follows for those who want it. */
export const processDisplayNames: Record<Process, string> = Object.fromEntries(
  Object.entries(processNames).map(([p, name]) => [p, `${p} (${name})`]),
) as Record<Process, string>;

export const profileNames: Record<ContinuityProfileId, string> = {
  'asme-ix': 'ASME IX QW-322',
  'aws-d1.1': 'AWS D1.1 qualification period',
  '49cfr-192.229b': '49 CFR 192.229(b) — gas pipelines',
  '49cfr-192.229c': '49 CFR 192.229(c) — gas pipelines at 20 % SMYS or more',
  '49cfr-192.229d': '49 CFR 192.229(d) — Appendix C welders',
  '49cfr-195.222b': '49 CFR 195.222(b) — liquid pipelines',
  'iso-9606-1-9.3a': 'ISO 9606-1 9.3 a) — retest every 3 years',
  'iso-9606-1-9.3b': 'ISO 9606-1 9.3 b) — every 2 years with tested welds',
  'iso-9606-1-9.3c': 'ISO 9606-1 9.3 c) — confirmed under a quality system',
};

export const evidenceKindNames: Record<EvidenceKind, string> = {
  use: 'Use of the process',
  test: 'Passing qualification test',
  'tested-weld': 'Tested weld (production weld examined and accepted)',
};

export const sourceKindNames: Record<LimitSource, string> = {
  published: 'Published',
  regulation: 'Regulation',
  'from-memory': 'From memory — check against the code edition in force',
  'common-practice': 'Common practice (no source)',
  'beadroll-default': 'Beadroll default (our conservative choice where the code is silent)',
};

export const monthCountingNames: Record<CfrMonthCounting, string> = {
  'same-day': 'From the day (conservative)',
  'whole-months': 'Whole calendar months (lenient)',
};

export const isoRevalidationNames: Record<IsoRevalidation, string> = {
  '9.3a': '9.3 a) — retest every 3 years',
  '9.3b': '9.3 b) — every 2 years with tested welds',
  '9.3c': '9.3 c) — confirmed under a quality system',
};

/** Every map, for a screen that looks a name up by what kind of id it holds. */
/** The parts of a coupon's examination (the form, the coupon page, the welder file and the WPQ PDF). */
export const examinationPartNames: Record<EvaluationPart['kind'], string> = {
  visual: 'Visual examination',
  bend: 'Guided bend tests',
  radiography: 'Radiography',
  ultrasonic: 'Ultrasonic examination',
  'fillet-break': 'Fillet weld break',
  'macro-etch': 'Macro-etch',
  'nick-break': 'Nick-break tests',
  combination: 'Combination of processes',
  retest: 'Retest',
};

/** What a visual examination may find. */
export const visualFindingNames: Record<VisualFindingType, string> = {
  crack: 'Crack',
  'lack-of-fusion': 'Lack of fusion',
  'incomplete-penetration': 'Incomplete penetration',
  undercut: 'Undercut',
  porosity: 'Porosity',
  overlap: 'Overlap',
  'unfilled-crater': 'Unfilled crater',
  reinforcement: 'Excess reinforcement',
  'root-concavity': 'Root concavity',
  'burn-through': 'Burn-through',
  other: 'Other',
};

/** Indications on a radiograph or an ultrasonic scan. */
export const indicationNames: Record<IndicationType, string> = {
  crack: 'Crack',
  'lack-of-fusion': 'Lack of fusion',
  'incomplete-penetration': 'Incomplete penetration',
  'elongated-slag': 'Elongated slag inclusion',
  'isolated-slag': 'Isolated slag inclusion',
  rounded: 'Rounded indication (porosity)',
  'burn-through': 'Burn-through',
  'hollow-bead': 'Hollow bead',
  'other-linear': 'Other linear indication',
};

export const displayNames = {
  codes: codeNames,
  criteria: criteriaNames,
  processes: processDisplayNames,
  profiles: profileNames,
  evidenceKinds: evidenceKindNames,
  sourceKinds: sourceKindNames,
  monthCountings: monthCountingNames,
  isoRevalidations: isoRevalidationNames,
} as const;

/** The trade's name of an id of the given kind; an unknown id comes back as it is. */
export function displayName(kind: keyof typeof displayNames, id: string): string {
  return (displayNames[kind] as Record<string, string>)[id] ?? id;
}
