// Request and response contracts of the qualification records (issue 4): the WPS register, test coupons
// with their examination, certified qualifications (WPQs), uploads and the public verify page.
// The API parses request bodies with these; the web resolves its forms and parses responses with them.
import { z } from 'zod';
import {
  codeIdSchema,
  criteriaIdSchema,
  isoDateSchema,
  lengthBounds,
  plausibleLengthSchema,
  positiveLengthSchema,
  lengthSchema,
  textSchema,
} from './common.js';
import { couponSchema, processes, transferModes, progressions } from './coupon.js';
import { bendSpecimenKinds, discontinuityTypes } from './bend.js';
import {
  couponEvaluationSchema,
  couponExaminationSchema,
  couponResults,
  filletBreakSchema,
  macroEtchSchema,
  nickBreakSpecimenSchema,
  retestBases,
  retestSchema,
  retestSetSchema,
  visualExaminationSchema,
  visualFindingSchema,
  volumetricExaminationSchema,
} from './examination.js';
import { weldingPositions } from '../ranges/positions.js';

const uuid = z.string().uuid('Choose one from the list');
const text = (max: number) => textSchema({ max, multiline: max > 120 });
const required = (max: number) => text(max).min(1, 'Required');

// ---- uploads ----------------------------------------------------------------------------------------

export const uploadKinds = ['wps-document', 'specimen-photo', 'examination-report', 'other'] as const;
export const uploadSchema = z.object({
  id: z.string(),
  fileName: z.string(),
  contentType: z.string(),
  size: z.number().int(),
  kind: z.enum(uploadKinds),
  createdAt: z.string(),
});
export type Upload = z.infer<typeof uploadSchema>;

// ---- procedures (WPS register) ----------------------------------------------------------------------

export const procedureStatuses = ['active', 'superseded'] as const;

// The fields of a WPS without defaults, so that a partial update leaves out what it does not name.
const procedureFields = z.object({
  number: required(40),
  revision: required(12),
  code: codeIdSchema,
  processes: z.array(z.enum(processes)).min(1, 'Choose at least one process').max(4),
  /** Base metal P-Numbers (or ISO material groups) as written on the WPS, e.g. ['1'] or ['8', '1']. */
  pNumbers: z.array(required(12)).max(6),
  fNumber: z.number().int().min(1).max(99).nullable().optional(),
  positions: z.array(z.enum(weldingPositions)).max(4),
  thicknessMin: positiveLengthSchema.nullable().optional(),
  thicknessMax: positiveLengthSchema.nullable().optional(),
  status: z.enum(procedureStatuses),
  documentUploadId: uuid.nullable().optional(),
  notes: text(2000),
});

export const procedureInput = procedureFields.extend({
  pNumbers: procedureFields.shape.pNumbers.default([]),
  positions: procedureFields.shape.positions.default([]),
  status: procedureFields.shape.status.default('active'),
  notes: procedureFields.shape.notes.optional().default(''),
});
export type ProcedureInput = z.input<typeof procedureInput>;

/** PATCH: only the fields named change (no defaults fill the others in); version is the one edited. */
export const procedureUpdateInput = procedureFields.partial().extend({ version: z.number().int().min(1) });
export type ProcedureUpdateInput = z.input<typeof procedureUpdateInput>;

export const procedureSchema = z.object({
  id: z.string(),
  number: z.string(),
  revision: z.string(),
  code: codeIdSchema,
  processes: z.array(z.enum(processes)),
  pNumbers: z.array(z.string()),
  fNumber: z.number().nullable(),
  positions: z.array(z.enum(weldingPositions)),
  thicknessMin: lengthSchema.nullable(),
  thicknessMax: lengthSchema.nullable(),
  status: z.enum(procedureStatuses),
  document: uploadSchema.nullable(),
  notes: z.string(),
  version: z.number().int(),
  createdAt: z.string(),
});
export type Procedure = z.infer<typeof procedureSchema>;

export const procedureListQuery = z.object({
  code: codeIdSchema.optional(),
  process: z.enum(processes).optional(),
  status: z
    .enum([...procedureStatuses, 'all'])
    .optional()
    .default('all'),
  q: textSchema({ max: 60 }).optional(),
});

// ---- coupons (a performance qualification test and its examination) -------------------------------

export const recordedDiscontinuitySchema = z.object({
  /** The size exactly as typed ('3/16', '1-1/4 in', '4 mm'), kept for the record. */
  sizeText: required(30),
  /** The parsed size (parseLength of sizeText); the server re-parses and refuses a mismatch. */
  size: plausibleLengthSchema(lengthBounds.discontinuity),
  location: z.enum(['surface', 'corner'], { error: 'Location must be surface or corner' }),
  type: z.enum(discontinuityTypes).optional(),
  fusionRelated: z.boolean().optional().default(false),
});

export const recordedSpecimenSchema = z.object({
  label: text(40).optional(),
  kind: z.enum(bendSpecimenKinds, { error: 'Kind must be face, root or side' }),
  discontinuities: z.array(recordedDiscontinuitySchema).max(100).default([]),
  photoUploadId: uuid.nullable().optional(),
});

export const examinationResults = ['accept', 'reject', 'replace-specimen'] as const;

export const examinationInput = z.discriminatedUnion('method', [
  z.object({
    method: z.literal('bend'),
    /** The coupon code's own criteria (the server refuses any other: issue 9). */
    criteria: criteriaIdSchema,
    /** An in-house set judged in addition to the code's, never instead (e.g. 'shop-general'). */
    additionalCriteria: criteriaIdSchema.optional(),
    specimens: z.array(recordedSpecimenSchema).min(1, 'Add at least one bend specimen').max(24),
  }),
  z.object({
    method: z.enum(['radiography', 'ultrasonic']),
    result: z.enum(['accept', 'reject'], { error: 'Record the examination result' }),
    reportNumber: text(60).optional().default(''),
    reportUploadId: uuid.nullable().optional(),
  }),
]);
export type ExaminationInput = z.input<typeof examinationInput>;

/**
 * The examination as the coupon form records it (the request shape couponRecordInput moves to): the parts
 * of couponExaminationSchema with the bend sizes as typed. The coupon's code decides the acceptance
 * criteria; `criteria`, when sent, must be that code (an in-house set goes in `additionalCriteria`,
 * applied in addition, never instead). Bodies of the first shape ({ method: 'bend' | 'radiography' |
 * 'ultrasonic', … }) are read through upgradeExamination.
 */
export const recordedExaminationSchema = z.object({
  criteria: criteriaIdSchema.optional(),
  additionalCriteria: criteriaIdSchema.optional(),
  bend: z
    .object({ specimens: z.array(recordedSpecimenSchema).min(1, 'Add at least one bend specimen').max(24) })
    .optional(),
  volumetric: volumetricExaminationSchema.extend({ reportUploadId: uuid.nullable().optional() }).optional(),
  filletBreak: filletBreakSchema.optional(),
  macroEtch: macroEtchSchema.optional(),
  nickBreak: z
    .object({ specimens: z.array(nickBreakSpecimenSchema).min(1, 'Add at least one specimen').max(24) })
    .optional(),
  layers: couponExaminationSchema.shape.layers,
  retest: retestSchema.optional(),
});
export type RecordedExamination = z.output<typeof recordedExaminationSchema>;
export type RecordedExaminationInput = z.input<typeof recordedExaminationSchema>;

/** The first request shape of an examination, read into the current one. */
export function upgradeExamination(raw: unknown): unknown {
  if (typeof raw !== 'object' || raw === null || !('method' in raw)) return raw;
  const old = raw as {
    method?: unknown;
    criteria?: unknown;
    specimens?: unknown;
    result?: unknown;
    reportNumber?: unknown;
    reportUploadId?: unknown;
    additionalCriteria?: unknown;
  };
  // The in-house set judged in addition to the code's travels with the examination, never dropped.
  const extra = old.additionalCriteria !== undefined ? { additionalCriteria: old.additionalCriteria } : {};
  if (old.method === 'bend') return { criteria: old.criteria, ...extra, bend: { specimens: old.specimens } };
  if (old.method === 'radiography' || old.method === 'ultrasonic')
    return {
      ...extra,
      volumetric: {
        method: old.method,
        indications: [],
        examinerResult: old.result,
        ...(typeof old.reportNumber === 'string' && old.reportNumber !== ''
          ? { reportNumber: old.reportNumber }
          : {}),
        reportUploadId: old.reportUploadId ?? null,
      },
    };
  return raw;
}

/** The visual examination: the examiner's result with any findings ('accept' / 'reject' alone still read). */
export const visualInput = z.preprocess(
  (v) => (typeof v === 'string' ? { result: v } : v),
  visualExaminationSchema,
);

/** A coupon's verdict with the fourth value: the examination the code calls for is not all recorded. */
export const couponVerdicts = couponResults;

/** The examination as stored and returned: as recorded, each bend specimen with its verdict and photo. */
export const examinationRecordSchema = recordedExaminationSchema.extend({
  bend: z
    .object({
      specimens: z.array(
        recordedSpecimenSchema.extend({
          result: z.enum(couponResults),
          reasons: z.array(z.object({ clause: z.string(), message: z.string() })),
          photo: uploadSchema.nullable(),
        }),
      ),
    })
    .optional(),
  volumetric: volumetricExaminationSchema.extend({ report: uploadSchema.nullable() }).optional(),
});
export type ExaminationRecord = z.infer<typeof examinationRecordSchema>;
export { couponEvaluationSchema };

export const couponRecordInput = z.object({
  welderId: uuid,
  shopId: uuid,
  procedureId: uuid,
  testedOn: isoDateSchema,
  coupon: couponSchema,
  /** Pipe given by size: the form fills outsideDiameter and thickness from pipeDimensions. */
  pipe: z
    .object({ nps: required(8), schedule: required(8) })
    .nullable()
    .optional(),
  pNumbers: z.array(required(12)).max(6).default([]),
  examiner: z.object({ name: required(120), certificateNumber: text(60).default('') }),
  labReportNumber: text(60).default(''),
  /** The visual examination ({ result, findings }; 'accept' / 'reject' alone still read). */
  visual: visualInput,
  /** Every part of the examination (first-shape bodies read through upgradeExamination). */
  examination: z.preprocess(upgradeExamination, recordedExaminationSchema),
  /** What the person recording it saw as the verdict; the server recomputes and refuses a mismatch. */
  claimedResult: z.enum(couponResults).optional(),
  notes: text(2000).default(''),
});
export type CouponRecordInput = z.input<typeof couponRecordInput>;

/** PATCH /api/coupons/:id: the whole record again (the welder cannot change) and the version edited. */
export const couponUpdateInput = couponRecordInput
  .omit({ welderId: true })
  .extend({ version: z.number().int().min(1) });
export type CouponUpdateInput = z.input<typeof couponUpdateInput>;

export const couponListQuery = z.object({
  welderId: uuid.optional(),
  result: z.enum(examinationResults).optional(),
});

export const couponReasonSchema = z.object({ clause: z.string(), message: z.string() });

export const couponRecordSchema = z.object({
  id: z.string(),
  welder: z.object({ id: z.string(), name: z.string(), stamp: z.string() }),
  shop: z.object({ id: z.string(), name: z.string(), code: z.string() }),
  procedure: z.object({ id: z.string(), number: z.string(), revision: z.string() }),
  testedOn: z.string(),
  coupon: couponSchema,
  pipe: z.object({ nps: z.string(), schedule: z.string() }).nullable(),
  pNumbers: z.array(z.string()),
  examiner: z.object({ name: z.string(), certificateNumber: z.string() }),
  labReportNumber: z.string(),
  visual: z.enum(['accept', 'reject']),
  /** The visual examination's findings, by type and size. */
  visualFindings: z.array(visualFindingSchema),
  /** Every part of the examination as recorded, each bend specimen with its verdict and photo. */
  examination: examinationRecordSchema,
  /** The server's verdict: visual and examination together. */
  result: z.enum(examinationResults),
  reasons: z.array(couponReasonSchema),
  criteriaId: criteriaIdSchema.nullable(),
  /** An in-house set applied in addition to the code's criteria. */
  additionalCriteriaId: criteriaIdSchema.nullable(),
  /** The evaluation as stored: parts, reasons, the code's criteria it met, rules version; null for
   *  coupons recorded before rules 2.0.0. */
  evaluation: couponEvaluationSchema.nullable(),
  rulesVersion: z.string(),
  /** The qualification certified from this coupon, if any. */
  qualificationId: z.string().nullable(),
  /** The failed coupon this one retests (examination.retest names it too). */
  retestOfId: z.string().nullable().default(null),
  /** A retest: the retest as a whole, judged over every coupon recorded as it (certification waits for it). */
  retestSet: z
    .object({
      verdict: retestSetSchema,
      coupons: z.array(
        z.object({
          id: z.string(),
          testedOn: z.string(),
          result: z.enum(examinationResults),
          qualificationId: z.string().nullable(),
        }),
      ),
    })
    .nullable()
    .default(null),
  /** A failed coupon: the coupons recorded as its retests, in the order tested. */
  retests: z
    .array(
      z.object({
        id: z.string(),
        testedOn: z.string(),
        basis: z.enum(retestBases),
        result: z.enum(examinationResults),
      }),
    )
    .default([]),
  notes: z.string(),
  version: z.number().int(),
  createdAt: z.string(),
  recordedBy: z.object({ id: z.string(), name: z.string() }).nullable(),
});
export type CouponRecord = z.infer<typeof couponRecordSchema>;

// ---- qualifications (certified WPQs) ----------------------------------------------------------------

export const certifyInput = z.object({
  certifiedOn: isoDateSchema,
  /** The coupon version the certifier looked at; a stale one gives 409. */
  version: z.number().int().min(1),
  /** A qualification of the same welder, code and process that this one corrects (it leaves the current lists). */
  supersedesId: uuid.optional(),
});
export type CertifyInput = z.infer<typeof certifyInput>;

export const revokeInput = z.object({
  revokedOn: isoDateSchema,
  reason: required(500),
});
export type RevokeInput = z.infer<typeof revokeInput>;

export const qualificationStates = ['current', 'lapsing', 'lapsed', 'revoked'] as const;

/** state absent: every qualification not superseded; 'superseded': only those; 'all': everything. */
export const qualificationListQuery = z.object({
  welderId: uuid.optional(),
  state: z.enum([...qualificationStates, 'superseded', 'all']).optional(),
});

export const qualificationSchema = z.object({
  id: z.string(),
  /** The company's record number, 'WPQ-2026-0042' (per company and year of certification). */
  number: z.string(),
  welder: z.object({ id: z.string(), name: z.string(), stamp: z.string() }),
  couponId: z.string(),
  code: codeIdSchema,
  process: z.enum(processes),
  transferMode: z.enum(transferModes).nullable(),
  progression: z.enum(progressions).nullable(),
  /** The qualifiedRanges output stored at certification (with its limits and clauses). */
  ranges: z.record(z.string(), z.unknown()),
  certifiedOn: z.string(),
  certifiedBy: z.object({ id: z.string(), name: z.string() }),
  rulesVersion: z.string(),
  status: z.object({
    state: z.enum(qualificationStates),
    lapsesOn: z.string(),
    daysLeft: z.number().int(),
    lastEvidence: z.string(),
  }),
  revokedOn: z.string().nullable(),
  revokedReason: z.string().nullable(),
  supersededById: z.string().nullable(),
  version: z.number().int(),
});
export type Qualification = z.infer<typeof qualificationSchema>;

// ---- public verify page -----------------------------------------------------------------------------

export const verifySchema = z.object({
  welder: z.object({ name: z.string(), stamp: z.string() }),
  company: z.string(),
  asOf: z.string(),
  /** The day the welder left the company, or null while they are with it (then nothing else is vouched for). */
  leftOn: z.string().nullable(),
  qualifications: z.array(
    z.object({
      code: codeIdSchema,
      process: z.enum(processes),
      state: z.enum(qualificationStates),
      lapsesOn: z.string(),
      summary: z.string(),
    }),
  ),
  notice: z.string(),
});
export type VerifyView = z.infer<typeof verifySchema>;

export const verifyTokenIssuedSchema = z.object({ url: z.string() });
export const verifyTokenStatusSchema = z.object({
  active: z.boolean(),
  issuedAt: z.string().nullable(),
  /** The live link (null when none is active, or it was sealed under another server secret). */
  url: z.string().nullable(),
  /** The documents that print the live link, in the trade's words ("the wallet card", "the WPQ record …"). */
  printedOn: z.array(z.string()),
});
export type VerifyTokenStatus = z.infer<typeof verifyTokenStatusSchema>;
