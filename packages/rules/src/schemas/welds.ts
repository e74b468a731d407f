// Request and response contracts of the production weld log (issue 12): a weld of a job with the welder of
// each process (root and fill may be two welders), its joint and its optional examination; the check made
// on entry against each welder's qualification and continuity on the date welded; the QA manager's
// disposition of a flagged weld. The API parses requests with these; the web builds bodies from them.
import { z } from 'zod';
import { isoDateSchema, searchQuerySchema, textSchema } from './common.js';
import { processes } from './coupon.js';
import { jointSchema } from './examination.js';
import { qualifiedOnAnswerSchema } from './qualified-on.js';

const uuid = z.string().uuid('Not a valid id');
const processSchema = z.enum(processes, { error: `Choose one of ${processes.join(', ')}` });

/** Which part of the weld a welder made with a process (common practice (no source)). */
export const weldLayers = ['root', 'fill', 'cap', 'all'] as const;
export type WeldLayer = (typeof weldLayers)[number];
export const weldLayerNames: Record<WeldLayer, string> = {
  root: 'Root',
  fill: 'Fill',
  cap: 'Cap',
  all: 'Whole weld',
};

/** The joint of a weld: the joint of the qualification check, with the pipe size as NPS + schedule allowed. */
export const weldJointSchema = jointSchema.extend({
  /** NPS and schedule, from which the outside diameter is read (ASME B36.10M/B36.19M) when it is not given. */
  nps: textSchema({ max: 12 }).optional(),
  schedule: textSchema({ max: 12 }).optional(),
});
export type WeldJoint = z.input<typeof weldJointSchema>;

export const weldPassInput = z.object({
  welderId: uuid,
  process: processSchema,
  layer: z.enum(weldLayers, { error: 'Say which part of the weld: root, fill, cap or whole weld' }),
});
export type WeldPassInput = z.infer<typeof weldPassInput>;

export const weldExaminationMethods = ['visual', 'RT', 'UT'] as const;
export const weldExaminationResults = ['accepted', 'rejected'] as const;
export type WeldExaminationResult = (typeof weldExaminationResults)[number];
export const weldExaminationSchema = z.object({
  method: z.enum(weldExaminationMethods, { error: 'Choose visual, RT or UT' }),
  reportNumber: textSchema({ max: 60 }).optional().default(''),
  result: z.enum(weldExaminationResults, { error: 'Say whether the weld was accepted or rejected' }),
  examinedOn: isoDateSchema.optional(),
});
export type WeldExamination = z.output<typeof weldExaminationSchema>;

export const weldInput = z
  .object({
    shopId: uuid,
    jobReference: textSchema({ max: 80, min: 1 }),
    weldNumber: textSchema({ max: 40, min: 1 }),
    weldedOn: isoDateSchema,
    procedureId: uuid.nullable().optional(),
    joint: weldJointSchema,
    passes: z
      .array(weldPassInput)
      .min(1, 'Name the welder of at least one process')
      .max(8, 'At most 8 welders on one weld'),
    examination: weldExaminationSchema.nullable().optional(),
    note: textSchema({ max: 500, multiline: true }).optional().default(''),
  })
  .superRefine((w, ctx) => {
    const seen = new Set<string>();
    w.passes.forEach((p, i) => {
      const key = `${p.welderId}:${p.process}:${p.layer}`;
      if (seen.has(key))
        ctx.addIssue({ code: 'custom', path: ['passes', i, 'layer'], message: 'This welder, process and part appear twice' });
      seen.add(key);
    });
    if (w.joint.form === 'pipe' && !w.joint.outsideDiameter && !(w.joint.nps && w.joint.schedule))
      ctx.addIssue({
        code: 'custom',
        path: ['joint', 'outsideDiameter'],
        message: 'Enter the pipe outside diameter, or its NPS and schedule',
      });
  });
export type WeldInput = z.output<typeof weldInput>;
export type WeldBody = z.input<typeof weldInput>;

const flagFilter = z.enum(['true', 'false', 'pending'], { error: 'flagged is true, false or pending' });
export const weldListQuery = z.object({
  job: searchQuerySchema,
  welderId: uuid.optional(),
  shopId: uuid.optional(),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  /** true: every flagged weld; pending: flagged and waiting for a disposition; false: not flagged. */
  flagged: flagFilter.optional(),
  page: z.coerce.number().int().min(1).optional().default(1),
});
export type WeldListQuery = z.output<typeof weldListQuery>;

/** What the QA manager decided about a flagged weld (common practice (no source): a nonconformance closed with a disposition). */
export const weldDispositions = ['accepted', 'cut-out', 'requalify'] as const;
export type WeldDisposition = (typeof weldDispositions)[number];
export const weldDispositionNames: Record<WeldDisposition, string> = {
  accepted: 'Accepted, with the reason',
  'cut-out': 'Cut out',
  requalify: 'Welder to requalify',
};
export const weldDispositionInput = z.object({
  decision: z.enum(weldDispositions, { error: 'Choose accepted, cut out or requalify' }),
  reason: textSchema({ max: 1000, min: 1, multiline: true }),
});
export type WeldDispositionInput = z.infer<typeof weldDispositionInput>;

// ---- responses --------------------------------------------------------------------------------------

export const weldReasonSchema = z.object({
  /** 'position', 'thickness', … for the ranges; 'lapsed', 'revoked', 'not-qualified', 'use-after-lapse'. */
  variable: z.string(),
  clause: z.string(),
  message: z.string(),
});
export type WeldReason = z.infer<typeof weldReasonSchema>;

export const weldPassSchema = z.object({
  id: z.string(),
  welder: z.object({ id: z.string(), stamp: z.string(), name: z.string() }),
  process: z.string(),
  layer: z.enum(weldLayers),
  qualified: z.boolean(),
  qualificationId: z.string().nullable(),
  qualificationNumber: z.string().nullable(),
  reasons: z.array(weldReasonSchema),
  /** The weld counted as documented use of the process for continuity (false: logged while lapsed or revoked). */
  countedForContinuity: z.boolean(),
});
export type WeldPass = z.infer<typeof weldPassSchema>;

export const weldSchema = z.object({
  id: z.string(),
  shop: z.object({ id: z.string(), name: z.string(), code: z.string() }),
  jobReference: z.string(),
  weldNumber: z.string(),
  weldedOn: z.string(),
  procedure: z.object({ id: z.string(), number: z.string(), revision: z.string() }).nullable(),
  joint: weldJointSchema,
  examination: weldExaminationSchema.nullable(),
  note: z.string(),
  passes: z.array(weldPassSchema),
  flagged: z.boolean(),
  checkedAt: z.string(),
  rulesVersion: z.string(),
  reviewStatus: z.enum(['pending', 'dispositioned']).nullable(),
  disposition: z
    .object({ decision: z.enum(weldDispositions), reason: z.string(), by: z.string().nullable(), at: z.string() })
    .nullable(),
  loggedBy: z.string().nullable(),
  createdAt: z.string(),
  version: z.number().int(),
});
export type Weld = z.infer<typeof weldSchema>;

export const weldPageSchema = z.object({
  items: z.array(weldSchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type WeldPage = z.infer<typeof weldPageSchema>;

/** A job's welds as a file (CSV for a spreadsheet, PDF to print). */
export const jobSummaryQuery = z.object({ job: textSchema({ max: 80, min: 1 }) });

/** Welders who may be named on a weld of a shop: every active welder of the company (any shop may weld anywhere). */
export const weldWelderQuery = z.object({ shopId: uuid, q: searchQuerySchema });

/** A welder found by stamp or name, with the qualifications the weld form checks a joint against live. */
export const weldWelderSchema = z.object({
  id: z.string(),
  stamp: z.string(),
  name: z.string(),
  homeShop: z.object({ id: z.string(), name: z.string(), code: z.string() }),
  qualifications: z.array(
    z.object({
      id: z.string(),
      number: z.string(),
      code: z.string(),
      process: z.string(),
      ranges: z.record(z.string(), z.unknown()),
      revokedOn: z.string().nullable(),
      /** The pair's lapse date as of today (the server's check reads continuity on the date welded). */
      lapsesOn: z.string().nullable(),
    }),
  ),
});
export type WeldWelder = z.infer<typeof weldWelderSchema>;
export const weldWelderListSchema = z.object({ items: z.array(weldWelderSchema) });

/** A weld with the proof behind each welder's check (the qualified-on answer of each pass). */
export const weldDetailSchema = weldSchema.extend({
  proof: z.array(z.object({ passId: z.string(), answer: qualifiedOnAnswerSchema })),
});
export type WeldDetail = z.infer<typeof weldDetailSchema>;

// ---- words --------------------------------------------------------------------------------------------

const sizeWords = (l: { value: number; unit: string } | undefined): string => (l ? `${l.value} ${l.unit}` : '');

/** A weld's joint in the trade's words: 'NPS 6 Sch 80 pipe (6.625 in OD), groove, position F, 0.432 in, F-No. 4, without backing'. */
export function weldJointWords(j: WeldJoint): string {
  const form =
    j.form === 'pipe'
      ? j.nps
        ? `NPS ${j.nps} Sch ${j.schedule ?? ''} pipe${j.outsideDiameter ? ` (${sizeWords(j.outsideDiameter)} OD)` : ''}`
        : `pipe ${sizeWords(j.outsideDiameter)} OD`
      : 'plate';
  return [
    form,
    j.weld,
    `position ${j.position}`,
    sizeWords(j.thickness),
    j.fNumber ? `F-No. ${j.fNumber}` : j.withoutFiller ? 'without filler' : '',
    j.backing ? 'with backing' : 'without backing',
    j.progression ?? '',
    j.transferMode ? `${j.transferMode} transfer` : '',
  ]
    .filter(Boolean)
    .join(', ');
}

const methodWords = { visual: 'Visual', RT: 'Radiography (RT)', UT: 'Ultrasonics (UT)' } as const;

/** 'Radiography (RT), report RT-24-0173: accepted', or 'Not examined'. */
export function weldExaminationWords(e: WeldExamination | null): string {
  if (!e) return 'Not examined';
  return `${methodWords[e.method]}${e.reportNumber ? `, report ${e.reportNumber}` : ''}: ${e.result}`;
}

/** The check of a weld in words: within, flagged and waiting, or flagged with its disposition. */
export function weldCheckWords(w: Pick<Weld, 'flagged' | 'disposition'>): string {
  if (!w.flagged && !w.disposition) return 'Within qualification';
  if (w.disposition) return `Flagged · ${weldDispositionNames[w.disposition.decision]}`;
  return 'Flagged · waiting for a disposition';
}
