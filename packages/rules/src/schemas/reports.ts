// The audit report (issue 13): for a shop or the whole company and a period — the qualification register as
// of the period's end, the continuity matrix (welder × process × month), lapses, renewals and revocations in
// the period, flagged use and its dispositions, and the lapse-watch notices sent. JSON, PDF and CSV.
import { z } from 'zod';
import { isoDateSchema } from './common.js';
import { qualificationStates } from './records.js';

export const MAX_REPORT_MONTHS = 24;

export const auditReportQuery = z
  .object({
    from: isoDateSchema,
    to: isoDateSchema,
    /** One shop (the welders whose home shop it is); absent: the whole company. */
    shopId: z.string().uuid('Choose a shop of your company').optional(),
  })
  .superRefine((q, ctx) => {
    if (q.to < q.from) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The period ends before it starts' });
    const months = (Number(q.to.slice(0, 4)) - Number(q.from.slice(0, 4))) * 12 + Number(q.to.slice(5, 7)) - Number(q.from.slice(5, 7)) + 1;
    if (months > MAX_REPORT_MONTHS) ctx.addIssue({ code: 'custom', path: ['to'], message: `At most ${MAX_REPORT_MONTHS} months in one report` });
  });
export type AuditReportQuery = z.infer<typeof auditReportQuery>;

/** A matrix cell: what the month holds for the welder and process (several may apply). */
export const matrixMarks = ['tested', 'used', 'flagged', 'lapsed'] as const;
export const matrixMarkLetters: Record<(typeof matrixMarks)[number], string> = { tested: 'T', used: 'U', flagged: 'F', lapsed: 'L' };

const who = { stamp: z.string(), name: z.string() };

export const auditReportSchema = z.object({
  company: z.string(),
  shop: z.object({ id: z.string(), code: z.string(), name: z.string() }).nullable(),
  from: z.string(),
  to: z.string(),
  generatedAt: z.string(),
  summary: z.object({
    welders: z.number().int(),
    qualifications: z.record(z.enum(qualificationStates), z.number().int()),
    lapses: z.number().int(),
    renewals: z.number().int(),
    revocations: z.number().int(),
    flaggedUse: z.object({ pending: z.number().int(), reviewed: z.number().int() }),
    noticesSent: z.number().int(),
  }),
  register: z.array(
    z.object({
      ...who,
      qualificationId: z.string(),
      number: z.string(),
      code: z.string(),
      process: z.string(),
      certifiedOn: z.string(),
      state: z.enum(qualificationStates),
      lapsesOn: z.string(),
      ranges: z.string(),
      clauses: z.string(),
    }),
  ),
  matrix: z.object({
    months: z.array(z.string()),
    rows: z.array(z.object({ ...who, process: z.string(), cells: z.array(z.array(z.enum(matrixMarks))) })),
  }),
  lapses: z.array(z.object({ ...who, code: z.string(), process: z.string(), lapsedOn: z.string() })),
  renewals: z.array(z.object({ ...who, code: z.string(), process: z.string(), renewedOn: z.string() })),
  revocations: z.array(z.object({ ...who, number: z.string(), code: z.string(), process: z.string(), revokedOn: z.string(), reason: z.string() })),
  flaggedUse: z.array(
    z.object({ ...who, entryId: z.string(), process: z.string(), usedOn: z.string(), job: z.string(), shop: z.string(), review: z.string(), decision: z.string(), note: z.string() }),
  ),
  notices: z.array(
    z.object({ ...who, number: z.string(), process: z.string(), threshold: z.string(), lapsesOn: z.string(), recipient: z.string(), sentAt: z.string() }),
  ),
  notice: z.string(),
});
export type AuditReport = z.infer<typeof auditReportSchema>;
