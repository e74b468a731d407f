// Input contract of the continuity status of one qualification (one welder, one process).
import { z } from 'zod';
import { codeIdSchema, isoDateSchema } from './common.js';

/** ISO 9606-1 9.3: a) retest every 3 years, b) every 2 years with production welds tested,
 *  c) no expiry while confirmed every six months under a verified quality system. */
export const isoRevalidationOptions = ['9.3a', '9.3b', '9.3c'] as const;
export type IsoRevalidation = (typeof isoRevalidationOptions)[number];
export const DEFAULT_ISO_REVALIDATION: IsoRevalidation = '9.3a';

/** How 49 CFR 192.229(b) "within the preceding 6 calendar months" is counted (the CFR does not say):
 *  'whole-months' (default): the month of the last evidence plus six whole calendar months after it;
 *  'same-day': six calendar months from the date, as for ASME IX. */
export const cfrMonthCountings = ['whole-months', 'same-day'] as const;
export type CfrMonthCounting = (typeof cfrMonthCountings)[number];
export const DEFAULT_CFR_MONTH_COUNTING: CfrMonthCounting = 'whole-months';

export const MAX_EVIDENCE = 5000;

export const continuityEvidenceSchema = z.object({
  date: isoDateSchema,
  kind: z.enum(['use', 'test'], { error: 'Kind must be use or test' }),
});
export type ContinuityEvidence = z.infer<typeof continuityEvidenceSchema>;

export const continuityInputSchema = z.object({
  code: codeIdSchema,
  /** Date of the passing test. */
  qualifiedOn: isoDateSchema,
  /** Documented use of the process, or a passing test with it. */
  evidence: z.array(continuityEvidenceSchema).max(MAX_EVIDENCE, `At most ${MAX_EVIDENCE} evidence entries`),
  asOf: isoDateSchema,
  warnDays: z.number().int('Whole days').min(0).max(366).optional(),
  revokedOn: isoDateSchema.optional(),
  isoRevalidation: z.enum(isoRevalidationOptions).optional(),
  cfrMonthCounting: z.enum(cfrMonthCountings).optional(),
});
export type ContinuityInput = z.input<typeof continuityInputSchema>;
