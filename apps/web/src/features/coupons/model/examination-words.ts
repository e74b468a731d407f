// The trade's words for the parts of a coupon's examination and what is recorded in them, so the form,
// the coupon page and the welder file never show the rules' internal codes.
import type {
  EvaluationPart,
  IndicationType,
  VisualFindingType,
} from '@beadroll/rules';

export const PART_NAMES: Record<EvaluationPart['kind'], string> = {
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

export const VISUAL_FINDING_WORDS: Record<VisualFindingType, string> = {
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

export const INDICATION_WORDS: Record<IndicationType, string> = {
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

export const RETEST_BASIS_WORDS = {
  immediate: 'Immediate retest',
  'after-training': 'Retest after further training',
} as const;

export const TRANSFER_WORDS = {
  spray: 'spray transfer',
  globular: 'globular transfer',
  pulse: 'pulsed spray transfer',
  'short-circuit': 'short-circuit transfer',
} as const;
