// Input contract of the continuity status of one qualification (one welder, one process).
import { z } from 'zod';
import { codeIdSchema, isoDateSchema } from './common.js';

/** ISO 9606-1 9.3: a) retest every 3 years, b) every 2 years with production welds tested,
 *  c) no expiry while confirmed every six months under a verified quality system. */
export const isoRevalidationOptions = ['9.3a', '9.3b', '9.3c'] as const;
export type IsoRevalidation = (typeof isoRevalidationOptions)[number];
export const DEFAULT_ISO_REVALIDATION: IsoRevalidation = '9.3a';

/** How the CFR's "calendar months" (49 CFR 192.229, 195.222) are counted; the CFR does not say.
 *  'same-day' (the conservative reading): N calendar months from the day of the evidence, as for ASME IX
 *    (use on January 20 counts through July 19 of a six-month window);
 *  'whole-months' (the lenient reading): the month of the evidence plus N whole calendar months after it
 *    (use in January counts through July 31).
 *  'same-day' never lapses later than 'whole-months'. */
export const cfrMonthCountings = ['whole-months', 'same-day'] as const;
export type CfrMonthCounting = (typeof cfrMonthCountings)[number];
/** The counting of the code's own rule when no profile is given (unchanged: the API's stored states use it). */
export const DEFAULT_CFR_MONTH_COUNTING: CfrMonthCounting = 'whole-months';
/** The counting of a continuity profile when none is chosen: the conservative reading. */
export const CONSERVATIVE_CFR_MONTH_COUNTING: CfrMonthCounting = 'same-day';

/** The periodic requalification profiles (continuity/profiles.ts), chosen per qualification. */
export const continuityProfileIds = [
  'asme-ix',
  'aws-d1.1',
  '49cfr-192.229b',
  '49cfr-192.229c',
  '49cfr-192.229d',
  '49cfr-195.222b',
  'iso-9606-1-9.3a',
  'iso-9606-1-9.3b',
  'iso-9606-1-9.3c',
] as const;
export type ContinuityProfileId = (typeof continuityProfileIds)[number];
export const continuityProfileIdSchema = z.enum(continuityProfileIds, {
  error:
    'Choose a continuity profile: ASME IX, AWS D1.1, 49 CFR 192.229(b), (c) or (d), 49 CFR 195.222(b), or ISO 9606-1 9.3 a), b) or c)',
});

/** What a dated piece of continuity evidence is:
 *  'use': documented welding with the process;
 *  'test': a certified passing qualification test of the pair (renews it, even after a lapse);
 *  'tested-weld': a production weld cut out or examined and found acceptable — use as well, and what
 *  49 CFR 192.229(c)/(d), 195.222(b) and ISO 9606-1 9.3 b ask for. */
export const evidenceKinds = ['use', 'test', 'tested-weld'] as const;
export type EvidenceKind = (typeof evidenceKinds)[number];

export const MAX_EVIDENCE = 5000;

export const continuityEvidenceSchema = z.object({
  date: isoDateSchema,
  kind: z.enum(evidenceKinds, { error: 'Kind must be use, test or tested-weld' }),
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
  /** The periodic requalification profile; omitted: the code's own rule, exactly as before profiles. */
  profile: continuityProfileIdSchema.optional(),
});
export type ContinuityInput = z.input<typeof continuityInputSchema>;
