// Input contracts of the guided bend test: the acceptance criteria shape (named sets and custom ones
// alike) and the specimens a QA manager records.
import { z } from 'zod';
import { criteriaIdSchema, lengthSchema, positiveLengthSchema } from './common.js';
import { bendSpecimenProposalInputSchema } from './coupon.js';

/** A size limit in either unit system; a missing one is the exact conversion of the other. */
export const sizeLimitSchema = z
  .object({
    in: z.number().positive().optional(),
    mm: z.number().positive().optional(),
  })
  .refine((l) => l.in !== undefined || l.mm !== undefined, {
    error: 'Give the limit in inches or millimetres',
  });
export type SizeLimit = z.infer<typeof sizeLimitSchema>;

export const discontinuityTypes = [
  'crack',
  'porosity',
  'slag',
  'lack-of-fusion',
  'undercut',
  'tear',
  'other',
] as const;
export type DiscontinuityType = (typeof discontinuityTypes)[number];

/** Corner discontinuities of these types have an internal cause and are judged like the rest (QW-163
 *  "lack of fusion, slag inclusions, or other internal discontinuities"). */
export const DEFAULT_CORNER_CAUSES: readonly DiscontinuityType[] = ['slag', 'lack-of-fusion', 'porosity'];

export const bendCriteriaSchema = z.object({
  id: z.string().trim().min(1, 'Required').max(60),
  name: z.string().trim().min(1, 'Required').max(120),
  /** The clause every reason cites, e.g. 'ASME IX QW-163'. */
  clause: z.string().trim().min(1, 'Required').max(120),
  /** Where the values come from and how sure we are: 'published: …', 'from memory: …', 'common practice (no source)'. */
  source: z.string().trim().min(1, 'Required').max(300),
  single: z.object({
    /** A discontinuity larger than this rejects the specimen (exactly at the limit passes). */
    max: sizeLimitSchema,
    /** Also reject above this fraction of the specified wall thickness, whichever is smaller. */
    wallFraction: z.number().positive().max(1).optional(),
  }),
  /** Sum of the counted discontinuities on one specimen; null or absent = no cumulative limit. */
  cumulative: z
    .object({
      max: sizeLimitSchema,
      /** Discontinuities of this size or less are not counted; absent = every judged one counts. */
      countAbove: sizeLimitSchema.optional(),
    })
    .nullable()
    .optional(),
  corner: z.object({
    /** 'unless-fusion-related': corner discontinuities are not considered unless slag, lack of fusion or
     *  another internal cause is evident; 'never': corners are judged like the rest of the surface. */
    ignore: z.enum(['unless-fusion-related', 'never']),
    /** Types that show a cause and make a corner discontinuity count; absent = slag, lack of fusion and
     *  porosity (the internal discontinuities). A discontinuity marked fusionRelated always counts. */
    causes: z.array(z.enum(discontinuityTypes)).max(7).optional(),
    /** A size up to which an ignored corner discontinuity stays ignored, and what happens above it. */
    allowance: z
      .object({
        max: sizeLimitSchema,
        /** true: a size equal to max is still within the allowance ("up to 1/4 in"); false: only
         *  sizes below it are ("less than 1/4 in"). */
        inclusive: z.boolean(),
        /** reject, test a replacement specimen, or judge it like any other discontinuity. */
        over: z.enum(['reject', 'replace-specimen', 'judge']),
      })
      .nullable()
      .optional(),
  }),
});
export type BendCriteria = z.infer<typeof bendCriteriaSchema>;

export const discontinuitySchema = z.object({
  /** Greatest dimension on the convex surface. */
  size: lengthSchema,
  /** corner = originating at the specimen's edge. */
  location: z.enum(['surface', 'corner'], { error: 'Location must be surface or corner' }),
  /** Visible slag, lack of fusion or another internal cause. */
  fusionRelated: z.boolean().optional(),
  type: z.enum(discontinuityTypes).optional(),
});
export type Discontinuity = z.infer<typeof discontinuitySchema>;

export const bendSpecimenKinds = ['face', 'root', 'side'] as const;

export const bendSpecimenSchema = z.object({
  id: z.string().max(40).optional(),
  kind: z.enum(bendSpecimenKinds, { error: 'Kind must be face, root or side' }),
  discontinuities: z.array(discontinuitySchema).max(200),
});
export type BendSpecimen = z.infer<typeof bendSpecimenSchema>;

export const bendTestInputSchema = z.object({
  criteria: z.union([criteriaIdSchema, bendCriteriaSchema]),
  /** Needed by criteria that limit by a fraction of the wall (api-1104). */
  wallThickness: positiveLengthSchema.optional(),
  specimens: z.array(bendSpecimenSchema).min(1, 'Add at least one specimen').max(24),
  /** The coupon the specimens come from: the set is then checked against the code's specimen table. */
  coupon: bendSpecimenProposalInputSchema.optional(),
});
export type BendTestInput = z.input<typeof bendTestInputSchema>;
