// Input and output contracts of a coupon's whole examination (evaluateCoupon) and of the joint check
// (jointWithin). The coupon form resolves with these, the API parses request bodies with them and stores
// the evaluation they describe.
import { z } from 'zod';
import { weldingPositions } from '../ranges/positions.js';
import { bendCriteriaSchema, bendSpecimenSchema } from './bend.js';
import { criteriaIdSchema, isoDateSchema, lengthSchema, positiveLengthSchema } from './common.js';
import { couponSchema, processes, progressions, transferModes } from './coupon.js';

const note = z.string().trim().max(500, 'At most 500 characters');

// ---- results -----------------------------------------------------------------------------------------

/** A coupon's verdict: 'incomplete' = the examination the code calls for is not all there yet. */
export const couponResults = ['accept', 'reject', 'replace-specimen', 'incomplete'] as const;
export type CouponResult = (typeof couponResults)[number];

/** The kinds of examination a coupon's parts can be, in the order they are judged. */
export const examinationKinds = [
  'visual',
  'bend',
  'radiography',
  'ultrasonic',
  'fillet-break',
  'macro-etch',
  'nick-break',
  'combination',
  'retest',
] as const;
export type ExaminationKind = (typeof examinationKinds)[number];

// ---- visual examination ------------------------------------------------------------------------------

export const visualFindingTypes = [
  'crack',
  'lack-of-fusion',
  'incomplete-penetration',
  'undercut',
  'porosity',
  'overlap',
  'unfilled-crater',
  'reinforcement',
  'root-concavity',
  'burn-through',
  'other',
] as const;
export type VisualFindingType = (typeof visualFindingTypes)[number];

export const visualFindingSchema = z.object({
  type: z.enum(visualFindingTypes, { error: `Type must be one of ${visualFindingTypes.join(', ')}` }),
  /** Depth (undercut, root concavity), height (reinforcement) or greatest dimension (the rest). */
  size: lengthSchema.optional(),
  note: note.optional(),
});
export type VisualFinding = z.infer<typeof visualFindingSchema>;

export const visualExaminationSchema = z.object({
  /** The examiner's judgment of the whole weld surface; findings are judged as well. */
  result: z.enum(['accept', 'reject'], { error: 'Record the visual examination result' }),
  findings: z.array(visualFindingSchema).max(50, 'At most 50 findings').optional(),
});
export type VisualExamination = z.input<typeof visualExaminationSchema>;

// ---- radiography / ultrasonics -----------------------------------------------------------------------

export const indicationTypes = [
  'crack',
  'lack-of-fusion',
  'incomplete-penetration',
  'elongated-slag',
  'isolated-slag',
  'rounded',
  'burn-through',
  'hollow-bead',
  'other-linear',
] as const;
export type IndicationType = (typeof indicationTypes)[number];

export const indicationSchema = z.object({
  type: z.enum(indicationTypes, { error: `Type must be one of ${indicationTypes.join(', ')}` }),
  /** Length (linear) or greatest dimension (rounded). */
  size: positiveLengthSchema,
  /** Width of a slag line, where the code limits it (API 1104). */
  width: positiveLengthSchema.optional(),
});
export type Indication = z.infer<typeof indicationSchema>;

export const volumetricExaminationSchema = z.object({
  method: z.enum(['radiography', 'ultrasonic'], { error: 'Method must be radiography or ultrasonic' }),
  /** Every indication found, by type and size; an empty list = none found. */
  indications: z.array(indicationSchema).max(200, 'At most 200 indications'),
  /** The film or examination report's own verdict, where recorded: a reject there always rejects. */
  examinerResult: z.enum(['accept', 'reject']).optional(),
  reportNumber: z.string().trim().max(60).optional(),
});
export type VolumetricExamination = z.input<typeof volumetricExaminationSchema>;

// ---- fillet weld break and macro-etch ------------------------------------------------------------------

export const filletBreakSchema = z.object({
  /** The specimen folded flat upon itself without fracturing. */
  bentFlat: z.boolean({ error: 'Say whether the specimen bent flat' }),
  crack: z.boolean().optional(),
  /** Fracture surface shows incomplete fusion at the root. */
  incompleteRootFusion: z.boolean().optional(),
  /** Greatest dimension of each inclusion or pore seen on the fracture surface. */
  inclusions: z.array(lengthSchema).max(100).optional(),
});
export type FilletBreak = z.input<typeof filletBreakSchema>;

export const macroEtchSchema = z.object({
  completeFusion: z.boolean({ error: 'Say whether the etched section shows complete fusion' }),
  crack: z.boolean().optional(),
  /** The two fillet legs measured on the etched section. */
  legs: z.tuple([positiveLengthSchema, positiveLengthSchema]).optional(),
  convexity: lengthSchema.optional(),
  concavity: lengthSchema.optional(),
  /** Specified fillet size, where the code asks the legs to reach it (AWS D1.1). */
  specifiedSize: positiveLengthSchema.optional(),
});
export type MacroEtch = z.input<typeof macroEtchSchema>;

// ---- API 1104 nick-break -------------------------------------------------------------------------------

export const nickBreakSpecimenSchema = z.object({
  id: z.string().max(40).optional(),
  /** The fractured surface shows complete penetration and fusion. */
  completePenetrationAndFusion: z.boolean({ error: 'Say whether penetration and fusion are complete' }),
  /** Greatest dimension of each gas pocket. */
  gasPockets: z.array(lengthSchema).max(200).optional(),
  /** Combined area of the gas pockets as a share of the exposed surface, in per cent. */
  gasPocketAreaPercent: z.number().min(0).max(100).optional(),
  slagInclusions: z
    .array(z.object({ depth: lengthSchema, length: lengthSchema }))
    .max(100)
    .optional(),
  /** Smallest distance between adjacent slag inclusions, where there are two or more. */
  slagMinSeparation: lengthSchema.optional(),
});
export type NickBreakSpecimen = z.input<typeof nickBreakSpecimenSchema>;

// ---- combination coupons and retests -------------------------------------------------------------------

export const depositLayerSchema = z.object({
  process: z.enum(processes, { error: `Process must be one of ${processes.join(', ')}` }),
  /** Weld metal this process deposited in the coupon. */
  depositedThickness: positiveLengthSchema,
  transferMode: z.enum(transferModes).optional(),
  fNumber: z.number().int().min(1).max(99).optional(),
  layers: z.number().int().min(1).max(200).optional(),
  /** GTAW/PAW without filler metal (QW-404.14). */
  withoutFiller: z.boolean().optional(),
});
export type DepositLayer = z.input<typeof depositLayerSchema>;

export const retestBases = ['immediate', 'after-training'] as const;
export type RetestBasis = (typeof retestBases)[number];
export const retestSchema = z.object({
  /** The failed test this one retests (its record id or report number). */
  of: z.string().trim().min(1, 'Name the failed test').max(60),
  failedOn: isoDateSchema.optional(),
  /** What failed on the first test: decides what the retest must include. */
  failedKind: z.enum(['visual', 'mechanical', 'volumetric']).optional(),
  basis: z.enum(retestBases, { error: 'Say whether this is an immediate retest or a retest after training' }),
  /** Retests already made after the failed test (0 for the first retest). */
  priorRetests: z.number().int().min(0).max(20).optional(),
  /** The verdicts of the other coupon(s) recorded as this same retest (an immediate retest of two coupons). */
  companions: z.array(z.enum(couponResults)).max(3).optional(),
});
export type Retest = z.input<typeof retestSchema>;

// ---- the whole examination -------------------------------------------------------------------------------

/** In-house acceptance criteria, applied in addition to the code's (never instead). */
export const additionalCriteriaSchema = z.union([criteriaIdSchema, bendCriteriaSchema]);

export const couponExaminationSchema = z.object({
  visual: visualExaminationSchema,
  /** Bend criteria of a stricter in-house set, judged in addition to the coupon code's own criteria. */
  additionalCriteria: additionalCriteriaSchema.optional(),
  bend: z
    .object({ specimens: z.array(bendSpecimenSchema).min(1, 'Add at least one bend specimen').max(24) })
    .optional(),
  volumetric: volumetricExaminationSchema.optional(),
  filletBreak: filletBreakSchema.optional(),
  macroEtch: macroEtchSchema.optional(),
  nickBreak: z
    .object({ specimens: z.array(nickBreakSpecimenSchema).min(1, 'Add at least one specimen').max(24) })
    .optional(),
  /** A combination coupon: one entry per process, root first (QW-306). */
  layers: z
    .array(depositLayerSchema)
    .min(2, 'A combination coupon has two processes or more')
    .max(4)
    .optional(),
  retest: retestSchema.optional(),
});
export type CouponExamination = z.input<typeof couponExaminationSchema>;

export const couponEvaluationInputSchema = couponExaminationSchema.extend({ coupon: couponSchema });
export type CouponEvaluationInput = z.input<typeof couponEvaluationInputSchema>;

// ---- the evaluation (output) --------------------------------------------------------------------------------

export const evaluationReasonSchema = z.object({ clause: z.string(), message: z.string() });
export type EvaluationReason = z.infer<typeof evaluationReasonSchema>;

export const criteriaRefSchema = z.object({
  id: z.string(),
  name: z.string(),
  clause: z.string(),
  source: z.string(),
});
export type CriteriaRef = z.infer<typeof criteriaRefSchema>;

export const evaluationPartSchema = z.object({
  kind: z.enum(examinationKinds),
  result: z.enum(couponResults),
  /** The criteria the part was judged by: the code's first, then an in-house set applied in addition. */
  criteria: z.array(criteriaRefSchema),
  reasons: z.array(evaluationReasonSchema),
  /** Indications looked at that did not count, and other remarks. */
  notes: z.array(evaluationReasonSchema),
  /** Per specimen (bend, nick-break) or per process (combination). */
  items: z
    .array(
      z.object({
        id: z.string().optional(),
        kind: z.string(),
        result: z.enum(couponResults),
        reasons: z.array(evaluationReasonSchema),
      }),
    )
    .optional(),
});
export type EvaluationPart = z.infer<typeof evaluationPartSchema>;

export const retestSetSchema = z.object({
  result: z.enum(['accept', 'reject', 'awaiting']),
  basis: z.enum(retestBases),
  needed: z.number().int(),
  recorded: z.number().int(),
  clause: z.string(),
  message: z.string(),
});

export const couponEvaluationSchema = z.object({
  result: z.enum(couponResults),
  parts: z.array(evaluationPartSchema),
  reasons: z.array(evaluationReasonSchema),
  /** The code's acceptance criteria the coupon was judged by (a certified WPQ names these). */
  codeCriteria: criteriaRefSchema,
  /** An in-house set applied in addition, if any. */
  additionalCriteria: criteriaRefSchema.nullable(),
  rulesVersion: z.string(),
  notice: z.string(),
  /** A retest: the retest as a whole (this coupon and the others recorded as the same retest). */
  retest: retestSetSchema.optional(),
});
export type CouponEvaluation = z.infer<typeof couponEvaluationSchema>;

// ---- the joint check -------------------------------------------------------------------------------------

export const jointSchema = z.object({
  form: z.enum(['plate', 'pipe'], { error: 'Form must be plate or pipe' }),
  weld: z.enum(['groove', 'fillet'], { error: 'Weld must be groove or fillet' }),
  position: z.enum(weldingPositions, { error: 'Position must be F, H, V or O' }),
  /** Groove: deposited weld metal (the joint thickness when welded by one welder and process). Fillet: base metal. */
  thickness: positiveLengthSchema,
  outsideDiameter: positiveLengthSchema.optional(),
  fNumber: z.number().int().min(1).max(99).optional(),
  /** Welded without filler metal (autogenous GTAW/PAW). */
  withoutFiller: z.boolean().optional(),
  backing: z.boolean({ error: 'Say whether the joint is welded with backing' }),
  progression: z.enum(progressions).optional(),
  transferMode: z.enum(transferModes).optional(),
});
export type Joint = z.input<typeof jointSchema>;

export const jointReasonSchema = z.object({ variable: z.string(), clause: z.string(), message: z.string() });
export type JointReason = z.infer<typeof jointReasonSchema>;
export type JointCheck = { within: boolean; reasons: JointReason[] };
