// Contracts of issue 12's two questions about production joints: "was this welder qualified for this
// joint on that day?" (GET /api/welders/:id/qualified-on) and "who may weld this joint from today through
// a day?" (GET /api/crew-finder). A joint arrives as query fields the way a foreman says it: plate or
// pipe, groove or fillet, the position as a letter (F, H, V, O) or as the fixed-pipe position it is
// welded in (5G: F, V and O; 6G: all), sizes typed as on the coupon form (`3/16`, `1-1/4 in`, `6 mm`) or
// a pipe as NPS and schedule ("6 in Sch 80": ASME B36.10M OD and wall).
import { z } from 'zod';
import { codeIdSchema, isoDateSchema } from './common.js';
import { processes, progressions, transferModes } from './coupon.js';
import { jointReasonSchema, jointSchema, type Joint } from './examination.js';
import { weldingPositions, type WeldingPosition } from '../ranges/positions.js';
import { parseLength, type Length } from '../units/length.js';
import { pipeDimensions } from '../pipes/pipe-dimensions.js';
import { RulesInputError } from '../validation/rules-input-error.js';

/** Each field problem of a rules error onto the query field that caused it. */
function addRulesIssues(e: unknown, fallbackField: string, ctx: z.RefinementCtx): void {
  if (e instanceof RulesInputError)
    for (const [k, message] of Object.entries(e.fields))
      ctx.addIssue({ code: 'custom', path: [k === 'nps' || k === 'schedule' ? k : fallbackField], message });
  else ctx.addIssue({ code: 'custom', path: [fallbackField], message: e instanceof Error ? e.message : 'Not valid' });
}

const processSchema = z.enum(processes, { error: `Choose one of ${processes.join(', ')}` });

/**
 * The positions a production joint is welded in. A plate joint or rotated pipe is welded in one; pipe
 * fixed horizontal (5G) goes round through flat, vertical and overhead, and fixed at 45° (6G) through all
 * four (common practice (no source): what a fixed joint asks of the welder is every position it passes).
 */
export const jointPositionWords = {
  F: ['F'],
  H: ['H'],
  V: ['V'],
  O: ['O'],
  '1G': ['F'],
  '2G': ['H'],
  '3G': ['V'],
  '4G': ['O'],
  '5G': ['F', 'V', 'O'],
  '6G': ['F', 'H', 'V', 'O'],
  '1F': ['F'],
  '2F': ['H'],
  '3F': ['V'],
  '4F': ['O'],
  '5F': ['F', 'V', 'O'],
} as const satisfies Record<string, readonly WeldingPosition[]>;
export type JointPositionWord = keyof typeof jointPositionWords;
const positionWords = Object.keys(jointPositionWords) as [JointPositionWord, ...JointPositionWord[]];

const flag = (name: string) =>
  z.enum(['true', 'false'], { error: `${name}: true or false` }).transform((v) => v === 'true');

/** A joint as query fields; parsed into the rules' Joint and the positions it is welded in. */
export const jointQueryFields = {
  form: z.enum(['plate', 'pipe'], { error: 'Form must be plate or pipe' }),
  weld: z.enum(['groove', 'fillet'], { error: 'Weld must be groove or fillet' }),
  position: z.enum(positionWords, { error: 'Position: F, H, V, O or the joint position 1G…6G, 1F…5F' }),
  /** Groove: deposited weld metal; fillet: base metal. Typed like a coupon size; default unit inches. */
  thickness: z.string().max(40).optional(),
  outsideDiameter: z.string().max(40).optional(),
  /** A pipe by NPS and schedule instead of OD (and the wall as thickness when no thickness is given). */
  nps: z.string().max(20).optional(),
  schedule: z.string().max(20).optional(),
  fNumber: z.coerce
    .number({ error: 'F-No.: a whole number' })
    .int('F-No.: a whole number')
    .min(1, 'F-No. 1 to 99')
    .max(99, 'F-No. 1 to 99')
    .optional(),
  withoutFiller: flag('Without filler').optional(),
  backing: z.enum(['with', 'without'], { error: 'Backing: with or without' }),
  progression: z.enum(progressions, { error: 'Progression: uphill or downhill' }).optional(),
  transferMode: z.enum(transferModes, { error: `Transfer mode: ${transferModes.join(', ')}` }).optional(),
};

type JointFields = z.output<z.ZodObject<typeof jointQueryFields>>;

function lengthField(text: string, field: string, ctx: z.RefinementCtx): Length | undefined {
  try {
    const l = parseLength(text);
    if (l.value > 0) return { value: l.value, unit: l.unit };
    ctx.addIssue({ code: 'custom', path: [field], message: 'Must be greater than zero' });
  } catch (e) {
    addRulesIssues(e, field, ctx);
  }
  return undefined;
}

/** The joint and its positions from the query fields, each problem on its field. */
export function jointFromFields(
  f: JointFields,
  ctx: z.RefinementCtx,
): { joint: Joint; positions: WeldingPosition[] } | undefined {
  let od: Length | undefined;
  let wall: Length | undefined;
  if (f.nps !== undefined || f.schedule !== undefined) {
    if (f.form !== 'pipe') ctx.addIssue({ code: 'custom', path: ['nps'], message: 'NPS and schedule describe pipe' });
    else if (!f.nps || !f.schedule)
      ctx.addIssue({ code: 'custom', path: [f.nps ? 'schedule' : 'nps'], message: 'Give both the NPS and the schedule' });
    else
      try {
        const d = pipeDimensions(f.nps, f.schedule);
        od = d.outsideDiameter;
        wall = d.wall;
      } catch (e) {
        addRulesIssues(e, 'schedule', ctx);
      }
  }
  if (f.outsideDiameter !== undefined) od = lengthField(f.outsideDiameter, 'outsideDiameter', ctx);
  const thickness = f.thickness !== undefined ? lengthField(f.thickness, 'thickness', ctx) : wall;
  if (f.thickness === undefined && !wall && !f.nps)
    ctx.addIssue({ code: 'custom', path: ['thickness'], message: 'Enter the thickness (or the pipe NPS and schedule)' });
  if (f.form === 'pipe' && !od && f.outsideDiameter === undefined && !f.nps)
    ctx.addIssue({ code: 'custom', path: ['outsideDiameter'], message: 'Enter the pipe OD (or the NPS and schedule)' });
  const positions = [...jointPositionWords[f.position]];
  if (!thickness || (f.form === 'pipe' && !od)) return undefined;
  const joint: Joint = {
    form: f.form,
    weld: f.weld,
    position: positions[0] as WeldingPosition,
    thickness,
    ...(od ? { outsideDiameter: od } : {}),
    ...(f.fNumber !== undefined ? { fNumber: f.fNumber } : {}),
    ...(f.withoutFiller !== undefined ? { withoutFiller: f.withoutFiller } : {}),
    backing: f.backing === 'with',
    ...(f.progression ? { progression: f.progression } : {}),
    ...(f.transferMode ? { transferMode: f.transferMode } : {}),
  };
  const checked = jointSchema.safeParse(joint);
  if (!checked.success) {
    for (const issue of checked.error.issues) ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
    return undefined;
  }
  return { joint, positions };
}

/** What the service takes: the day, the process (and code), the joint and every position it is welded in. */
export const qualifiedOnInputSchema = z.object({
  date: isoDateSchema,
  process: processSchema,
  code: codeIdSchema.optional(),
  joint: jointSchema,
  positions: z.array(z.enum(weldingPositions)).min(1).optional(),
});
export type QualifiedOnInput = z.input<typeof qualifiedOnInputSchema>;

/** GET /api/welders/:id/qualified-on?date=&process=&code=&form=&weld=&position=&thickness=&… */
export const qualifiedOnQueryFields = z
  .object({ date: isoDateSchema, process: processSchema, code: codeIdSchema.optional(), ...jointQueryFields })
  .strict();
export const qualifiedOnQuery = qualifiedOnQueryFields.transform((q, ctx): QualifiedOnInput => {
    const j = jointFromFields(q, ctx);
    if (!j) return z.NEVER;
    return { date: q.date, process: q.process, ...(q.code ? { code: q.code } : {}), joint: j.joint, positions: j.positions };
  });

// ---- the answer -----------------------------------------------------------------------------------

export const qualifiedOnReasonVariables = [
  'position',
  'thickness',
  'diameter',
  'form',
  'fNumber',
  'backing',
  'progression',
  'transferMode',
  'qualification',
  'not-yet-qualified',
  'superseded',
  'revoked',
  'lapsed',
] as const;

export const qualifiedOnReasonSchema = jointReasonSchema.extend({ qualificationId: z.string().nullable() });
export type QualifiedOnReason = z.infer<typeof qualifiedOnReasonSchema>;

const limitSchema = z.object({ variable: z.string(), clause: z.string(), text: z.string(), source: z.string() });

/** One row of continuity evidence on or before the date, with the walk's verdict on it. */
export const proofEvidenceSchema = z.object({
  date: z.string(),
  /** test: a certified passing coupon of the pair (the qualification or a renewal); use: logged or other use. */
  kind: z.enum(['test', 'use']),
  /** continuity-log: a logged entry; weld-log: a pass of a logged production weld; coupon: a passing coupon. */
  source: z.enum(['coupon', 'continuity-log', 'weld-log', 'other']),
  counted: z.boolean(),
  renewal: z.boolean(),
  /** Why an uncounted row did not count. */
  note: z.string(),
  entryId: z.string().nullable(),
  couponId: z.string().nullable(),
  /** The production weld behind a weld-log row, and its weld or joint number. */
  weldId: z.string().nullable(),
  weldNumber: z.string().nullable(),
  job: z.string().nullable(),
  shop: z.string().nullable(),
  loggedBy: z.string().nullable(),
  loggedAt: z.string().nullable(),
  flagged: z.boolean(),
  reviewStatus: z.string().nullable(),
});
export type ProofEvidence = z.infer<typeof proofEvidenceSchema>;

export const proofQualificationSchema = z.object({
  id: z.string(),
  number: z.string(),
  code: z.string(),
  codeName: z.string(),
  process: z.string(),
  certifiedOn: z.string(),
  certifiedBy: z.string(),
  rulesVersion: z.string(),
  coupon: z.object({
    id: z.string(),
    testedOn: z.string(),
    wps: z.string(),
    shop: z.string(),
    testPosition: z.string(),
    result: z.string(),
    visual: z.string(),
    examination: z.string(),
    labReportNumber: z.string(),
  }),
  limits: z.array(limitSchema),
  /** The joint against the ranges (every position it is welded in). */
  joint: z.object({ within: z.boolean(), reasons: z.array(jointReasonSchema) }),
  /** Continuity as of the date, from the evidence known on that day. */
  continuity: z.object({
    inForce: z.boolean(),
    state: z.enum(['in-force', 'not-yet-qualified', 'superseded', 'revoked', 'lapsed']),
    qualifiedOn: z.string(),
    lastEvidence: z.string().nullable(),
    lastTest: z.string().nullable(),
    lapsesOn: z.string().nullable(),
    renewedOn: z.string().nullable(),
    clause: z.string(),
    rule: z.string(),
    evidence: z.array(proofEvidenceSchema),
  }),
  revocation: z
    .object({ revokedOn: z.string(), reason: z.string(), by: z.string().nullable() })
    .nullable(),
  supersededBy: z.object({ id: z.string(), number: z.string(), testedOn: z.string() }).nullable(),
  qualified: z.boolean(),
  reasons: z.array(jointReasonSchema),
});
export type ProofQualification = z.infer<typeof proofQualificationSchema>;

export const qualifiedOnEvidenceSchema = z.object({
  welder: z.object({ id: z.string(), name: z.string(), stamp: z.string(), homeShop: z.string() }),
  asked: z.object({
    date: z.string(),
    process: z.string(),
    code: z.string().nullable(),
    joint: jointSchema,
    positions: z.array(z.enum(weldingPositions)),
    description: z.string(),
  }),
  qualifications: z.array(proofQualificationSchema),
  answeredAt: z.string(),
});
export type QualifiedOnEvidence = z.infer<typeof qualifiedOnEvidenceSchema>;

export const qualifiedOnAnswerSchema = z.object({
  qualified: z.boolean(),
  qualificationId: z.string().nullable(),
  reasons: z.array(qualifiedOnReasonSchema),
  evidence: qualifiedOnEvidenceSchema,
  rulesVersion: z.string(),
  notice: z.string(),
});
export type QualifiedOnAnswer = z.infer<typeof qualifiedOnAnswerSchema>;

// ---- the crew finder ----------------------------------------------------------------------------------

/** Rows per page of the crew finder: the default, and the most one request may ask for. */
export const CREW_PAGE_DEFAULT = 50;
export const CREW_PAGE_MAX = 1000;

/** GET /api/crew-finder?process=&code=&shopId=&through=&form=&weld=&position=&… — through: the range's last day (default today). */
export const crewFinderQueryFields = z
  .object({
    process: processSchema,
    code: codeIdSchema.optional(),
    shopId: z.string().uuid('Not a valid shop').optional(),
    through: isoDateSchema.optional(),
    /** A page of the crew (longest in force first) and a page of the near misses; totals are exact. */
    limit: z.coerce.number().int('A whole number').min(1, 'At least 1').max(CREW_PAGE_MAX, `At most ${CREW_PAGE_MAX}`).optional(),
    offset: z.coerce.number().int('A whole number').min(0, 'Not below 0').optional(),
    nearLimit: z.coerce.number().int('A whole number').min(1, 'At least 1').max(CREW_PAGE_MAX, `At most ${CREW_PAGE_MAX}`).optional(),
    nearOffset: z.coerce.number().int('A whole number').min(0, 'Not below 0').optional(),
    ...jointQueryFields,
  })
  .strict();
export const crewFinderQuery = crewFinderQueryFields.transform((q, ctx) => {
  const j = jointFromFields(q, ctx);
  if (!j) return z.NEVER;
  return {
    process: q.process,
    ...(q.code ? { code: q.code } : {}),
    ...(q.shopId ? { shopId: q.shopId } : {}),
    ...(q.through ? { through: q.through } : {}),
    ...(q.limit !== undefined ? { limit: q.limit } : {}),
    ...(q.offset !== undefined ? { offset: q.offset } : {}),
    ...(q.nearLimit !== undefined ? { nearLimit: q.nearLimit } : {}),
    ...(q.nearOffset !== undefined ? { nearOffset: q.nearOffset } : {}),
    joint: j.joint,
    positions: j.positions,
  };
});
export type CrewFinderInput = z.output<typeof crewFinderQuery>;

const crewWelderSchema = z.object({ id: z.string(), stamp: z.string(), name: z.string(), homeShop: z.string() });
const crewQualificationSchema = z.object({ id: z.string(), number: z.string(), code: z.string(), codeName: z.string() });

export const crewMemberSchema = z.object({
  welder: crewWelderSchema,
  qualification: crewQualificationSchema,
  /** First day the welder may no longer weld it with that qualification (unless more use is logged). */
  lapsesOn: z.string(),
  lastEvidence: z.string(),
});
export type CrewMember = z.infer<typeof crewMemberSchema>;

export const nearMissKinds = ['lapses-in-range', 'out-of-range', 'lapsed', 'revoked'] as const;
export const nearMissSchema = z.object({
  welder: crewWelderSchema,
  qualification: crewQualificationSchema,
  kind: z.enum(nearMissKinds),
  /** The one reason that keeps the welder off the crew. */
  reason: jointReasonSchema,
  lapsesOn: z.string(),
});
export type NearMiss = z.infer<typeof nearMissSchema>;

export const crewFinderAnswerSchema = z.object({
  asked: z.object({
    process: z.string(),
    code: z.string().nullable(),
    shopId: z.string().nullable(),
    from: z.string(),
    through: z.string(),
    joint: jointSchema,
    positions: z.array(z.enum(weldingPositions)),
    description: z.string(),
  }),
  crew: z.object({ total: z.number().int(), offset: z.number().int(), limit: z.number().int(), items: z.array(crewMemberSchema) }),
  nearMisses: z.object({ total: z.number().int(), offset: z.number().int(), limit: z.number().int(), items: z.array(nearMissSchema) }),
  rulesVersion: z.string(),
  notice: z.string(),
});
export type CrewFinderAnswer = z.infer<typeof crewFinderAnswerSchema>;
