// @beadroll/rules: the single source of truth for Beadroll's computation and its input contracts.
import './validation/plain-messages.js';
export * from './schemas/foundation.js';

// input contracts of the domain
export * from './schemas/common.js';
export * from './schemas/bend.js';
export * from './schemas/coupon.js';
export * from './schemas/examination.js';
export * from './schemas/continuity.js';
export * from './schemas/records.js';
export * from './schemas/continuity-admin.js';
export * from './schemas/continuity-log.js';
export * from './schemas/api-tokens.js';
export * from './schemas/sessions.js';
export * from './schemas/imports.js';
export * from './schemas/reports.js';
export * from './schemas/qualified-on.js';
export * from './schemas/welds.js';
export { RulesInputError } from './validation/rules-input-error.js';
export { fieldsOf } from './validation/parse-input.js';
export { RULES_VERSION } from './version.js';

// units and pipe sizes
export {
  MM_PER_INCH,
  formatLength,
  formatLengthBoth,
  inchFraction,
  limitIn,
  parseLength,
  toInches,
  toMm,
  type DualSize,
  type FormatLengthOptions,
  type Length,
  type LengthUnit,
  type ParsedLength,
} from './units/length.js';
export {
  b3610mPipeSizes,
  b3619mPipeSizes,
  pipeSchedules,
  pipeStandardOf,
  stainlessPipeSchedules,
  type PipeSchedule,
  type PipeSizeRow,
} from './pipes/b36-10m.js';
export { normalizeNps, normalizeSchedule, pipeDimensions } from './pipes/pipe-dimensions.js';

// bend tests
export { criteriaSets } from './bend/criteria-sets.js';
export {
  bendSetCompleteness,
  evaluateBendTest,
  type BendEvaluation,
  type BendReason,
  type BendResult,
  type SpecimenEvaluation,
} from './bend/evaluate-bend-test.js';
export {
  api1104Specimens,
  couponsOf,
  proposeBendSpecimens,
  type Api1104Specimens,
  type BendSpecimenProposal,
  type SpecimenKind,
  type SpecimenSet,
} from './bend/propose-specimens.js';

// the whole examination of a coupon
export { evaluateCoupon } from './examination/evaluate-coupon.js';
export { couponPerProcess } from './examination/combination.js';
export {
  RETEST_RULES,
  failedKindOf,
  retestOptions,
  retestSetOf,
  retestSetVerdict,
  type RetestCoupon,
  type RetestOption,
  type RetestSetResult,
  type RetestSetVerdict,
} from './examination/retests.js';

// qualified ranges
export * from './ranges/positions.js';
export {
  asmeFNumberGroups,
  awsSmawFNumbers,
  fNumberInterchange,
  fNumberRow,
  type FNumberGroup,
  type Backing,
  type FNumberInterchangeRow,
  type FNumberQualification,
} from './ranges/f-numbers.js';
export {
  positionTables,
  type LimitSource,
  type PositionRow,
  type PositionTable,
  type PositionTableSet,
} from './ranges/position-tables.js';
export { qualifiedRanges, RANGES_NOTICE, type QualifiedRanges } from './ranges/qualified-ranges.js';
export { jointWithin } from './ranges/joint-within.js';
export * from './ranges/paper-ranges.js';
export { type Interval, type RangeLimit } from './ranges/size-ranges.js';

// continuity
export { addDays, addMonths, addYears, daysBetween, isIsoDate, type IsoDate } from './continuity/calendar.js';
export {
  lapseRuleFor,
  lapseRules,
  lapsesOnFor,
  type LapseOptions,
  type LapseRule,
} from './continuity/lapse-rules.js';
export {
  continuityStatus,
  DEFAULT_WARN_DAYS,
  type ContinuityRequirementStatus,
  type ContinuityState,
  type ContinuityStatus,
} from './continuity/continuity-status.js';
export {
  continuityProfiles,
  defaultContinuityProfile,
  profileOfCode,
  type ContinuityCheck,
  type ContinuityPeriod,
  type ContinuityProfile,
  type ContinuityRequirement,
} from './continuity/profiles.js';

// the trade's names of internal ids, for every screen, PDF and e-mail
export * from './names/display-names.js';

// dates as every screen, PDF and e-mail writes them
export {
  COMPANY_LOCALE,
  formatDay,
  formatInstant,
  formatInstantDay,
  type DateStyle,
} from './dates/format-dates.js';
