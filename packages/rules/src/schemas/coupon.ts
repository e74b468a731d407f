// Input contract of a performance qualification test coupon, as qualifiedRanges and the coupon form use it.
import { z } from 'zod';
import { testPositions } from '../ranges/positions.js';
import { codeIdSchema, lengthBounds, plausibleLengthSchema, positiveLengthSchema } from './common.js';

export const processes = ['SMAW', 'GTAW', 'GMAW', 'FCAW', 'SAW', 'PAW', 'OFW'] as const;
export type Process = (typeof processes)[number];
export const processNames: Record<Process, string> = {
  SMAW: 'shielded metal arc (stick)',
  GTAW: 'gas tungsten arc (TIG)',
  GMAW: 'gas metal arc (MIG/MAG)',
  FCAW: 'flux-cored arc',
  SAW: 'submerged arc',
  PAW: 'plasma arc',
  OFW: 'oxyfuel gas',
};

export const transferModes = ['spray', 'globular', 'pulse', 'short-circuit'] as const;
export type TransferMode = (typeof transferModes)[number];
export const progressions = ['uphill', 'downhill'] as const;
export type Progression = (typeof progressions)[number];

export const couponSchema = z.object({
  code: codeIdSchema,
  process: z.enum(processes, { error: `Process must be one of ${processes.join(', ')}` }),
  transferMode: z.enum(transferModes).optional(),
  form: z.enum(['plate', 'pipe'], { error: 'Form must be plate or pipe' }),
  weld: z.enum(['groove', 'fillet'], { error: 'Weld must be groove or fillet' }),
  position: z
    .string({ error: 'Choose a test position' })
    .transform((p) => p.trim().toUpperCase().replace(/\s+/g, '').replace('&', '+'))
    .pipe(z.enum(testPositions, { error: `Position must be one of ${testPositions.join(', ')}` })),
  /** Coupon thickness (pipe: wall). */
  thickness: plausibleLengthSchema(lengthBounds.thickness),
  /** Weld metal deposited by this welder with this process; the coupon thickness if absent. */
  depositedThickness: plausibleLengthSchema(lengthBounds.depositedThickness).optional(),
  layers: z.number().int('Whole number of layers').min(1).max(200).optional(),
  outsideDiameter: plausibleLengthSchema(lengthBounds.outsideDiameter).optional(),
  backing: z.boolean({ error: 'Say whether the coupon was welded with backing' }),
  fNumber: z.number().int('F-No. is a whole number').min(1).max(99).optional(),
  /** GTAW or PAW welded without filler metal (autogenous): qualifies welding without filler only (QW-404.14). */
  withoutFiller: z.boolean().optional(),
  progression: z.enum(progressions).optional(),
});
export type CouponInput = z.input<typeof couponSchema>;
export type Coupon = z.output<typeof couponSchema>;

export const bendSpecimenProposalInputSchema = z.object({
  code: codeIdSchema,
  form: couponSchema.shape.form,
  position: couponSchema.shape.position,
  depositedThickness: positiveLengthSchema,
  /** Pipe OD: API 1104 takes its specimen count from the OD and the wall. */
  outsideDiameter: positiveLengthSchema.optional(),
  /** Coupon thickness (pipe wall), where it differs from the deposit (API 1104 counts by the wall). */
  thickness: positiveLengthSchema.optional(),
});
export type BendSpecimenProposalInput = z.input<typeof bendSpecimenProposalInputSchema>;
