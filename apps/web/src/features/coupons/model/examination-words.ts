// The trade's words for the parts of a coupon's examination and what is recorded in them, so the form,
// the coupon page and the welder file never show the rules' internal codes.
// The words of the parts, visual findings and indications are the rules package's (the WPQ PDF uses them
// too); the form's own words follow.
export {
  examinationPartNames as PART_NAMES,
  indicationNames as INDICATION_WORDS,
  visualFindingNames as VISUAL_FINDING_WORDS,
} from '@beadroll/rules';

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
