// Building blocks shared by the domain input schemas: lengths, codes, ISO dates.
import { z } from 'zod';
import { isIsoDate } from '../continuity/calendar.js';

export const lengthUnits = ['in', 'mm'] as const;

export const lengthSchema = z.object({
  value: z.number({ error: 'Enter a number' }).nonnegative('A length cannot be negative'),
  unit: z.enum(lengthUnits, { error: 'Unit must be in or mm' }),
});

export const positiveLengthSchema = z.object({
  value: z.number({ error: 'Enter a number' }).positive('Must be greater than zero'),
  unit: lengthSchema.shape.unit,
});

export const codeIds = ['asme-ix', 'aws-d1.1', 'api-1104', 'iso-9606-1'] as const;
export const codeIdSchema = z.enum(codeIds, {
  error: 'Choose one of asme-ix, aws-d1.1, api-1104, iso-9606-1',
});
export type CodeId = (typeof codeIds)[number];

export const criteriaIds = [...codeIds, 'shop-general'] as const;
export const criteriaIdSchema = z.enum(criteriaIds, {
  error: `Choose one of ${criteriaIds.join(', ')}`,
});
export type CriteriaId = (typeof criteriaIds)[number];

export const isoDateSchema = z
  .string({ error: 'Enter a date' })
  .refine(isIsoDate, { error: 'Use a real calendar date written YYYY-MM-DD (year 1900 or later)' });

// ---- plausible sizes --------------------------------------------------------------------------------

/** The sizes a person can sensibly record for one thing on a welder's test coupon, in each unit system. */
export interface LengthBounds {
  /** What is measured, as the error names it: 'The coupon thickness'. */
  what: string;
  min: { in: number; mm: number };
  max: { in: number; mm: number };
  /** true: the minimum itself is allowed; false: only sizes above it (a size of zero means nothing). */
  minInclusive: boolean;
}

// Common practice (no source): the thinnest sheet and tube walls a welder is tested on are about
// 0.5 mm; the thickest test plates and walls a few inches; coupon pipe runs from small tube to NPS 48
// and shells beyond it. The bounds refuse typing slips (99999999, 1e20, 0), not unusual work.
export const lengthBounds = {
  thickness: { what: 'The coupon thickness', min: { in: 0.01, mm: 0.25 }, max: { in: 12, mm: 300 }, minInclusive: true },
  depositedThickness: {
    what: 'The deposited weld metal thickness',
    min: { in: 0.01, mm: 0.25 },
    max: { in: 12, mm: 300 },
    minInclusive: true,
  },
  outsideDiameter: { what: 'The outside diameter', min: { in: 0.25, mm: 6 }, max: { in: 240, mm: 6000 }, minInclusive: true },
  discontinuity: { what: 'A discontinuity', min: { in: 0, mm: 0 }, max: { in: 12, mm: 300 }, minInclusive: false },
} as const satisfies Record<string, LengthBounds>;

const boundText = (v: number, unit: 'in' | 'mm'): string =>
  `${Math.abs(v) >= 1e9 ? v.toExponential() : String(v)} ${unit}`;

/** Why a length is not a plausible size for what it measures, or null when it is. */
export function implausibleLength(l: { value: number; unit: 'in' | 'mm' }, b: LengthBounds): string | null {
  const min = b.min[l.unit];
  const max = b.max[l.unit];
  if (!Number.isFinite(l.value)) return `${b.what} must be a number`;
  const tooSmall = b.minInclusive ? l.value < min : l.value <= min;
  if (!tooSmall && l.value <= max) return null;
  const range = b.minInclusive
    ? `${boundText(min, l.unit)} to ${boundText(max, l.unit)}`
    : `more than ${boundText(min, l.unit)} and at most ${boundText(max, l.unit)}`;
  return `${b.what} of ${boundText(l.value, l.unit)} is not a plausible size: enter ${range}`;
}

/** A length that must be a plausible size for what it measures (the form and the API refuse the same). */
export const plausibleLengthSchema = (b: LengthBounds) =>
  z
    .object({ value: z.number({ error: 'Enter a number' }), unit: lengthSchema.shape.unit })
    .superRefine((l, ctx) => {
      const problem = implausibleLength(l, b);
      if (problem) ctx.addIssue({ code: 'custom', path: ['value'], message: problem });
    });
