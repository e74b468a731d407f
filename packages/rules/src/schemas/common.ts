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
