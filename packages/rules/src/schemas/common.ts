// Building blocks shared by the domain input schemas: lengths, codes, ISO dates.
import { z } from 'zod';
import { isIsoDate } from '../continuity/calendar.js';

export const lengthUnits = ['in', 'mm'] as const;

// ---- text -------------------------------------------------------------------------------------------
// One rule for every piece of text the project accepts (names, notes, codes, search words): no control
// characters (NUL and the rest of C0 and C1, DEL) and no half of a UTF-16 surrogate pair. Such text
// cannot be stored by PostgreSQL, printed on a PDF or shown on a screen, so it is refused up front with a
// message on its field. Multi-line text (notes) may carry tab, line feed and carriage return.

// eslint-disable-next-line no-control-regex
const CONTROL_ONE_LINE = /[\u0000-\u001F\u007F-\u009F]/;
// eslint-disable-next-line no-control-regex
const CONTROL_MULTI_LINE = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export const TEXT_CONTROL_MESSAGE = 'Remove the control characters (such as NUL) from this text';
export const TEXT_SURROGATE_MESSAGE = 'This text holds a broken character; type or paste it again';

/** Why a string is not acceptable text, or null when it is. */
export function textProblem(s: string, multiline = false): string | null {
  if ((multiline ? CONTROL_MULTI_LINE : CONTROL_ONE_LINE).test(s)) return TEXT_CONTROL_MESSAGE;
  if (LONE_SURROGATE.test(s)) return TEXT_SURROGATE_MESSAGE;
  return null;
}

export interface TextOptions {
  /** Upper bound in characters (UTF-16 code units, as the database and the form count them). */
  max: number;
  /** Lower bound after trimming; 1 makes the field required. Default 0. */
  min?: number;
  /** Allow tab, line feed and carriage return (notes). Default false. */
  multiline?: boolean;
}

/** The text schema of the project: trimmed, bounded, free of control characters and broken pairs. */
export function textSchema({ max, min = 0, multiline = false }: TextOptions) {
  let s = z.string({ error: 'Enter text' }).trim();
  if (min > 0) s = s.min(min, min === 1 ? 'Required' : `At least ${min} characters`);
  return s.max(max, `At most ${max} characters`).superRefine((v, ctx) => {
    const problem = textProblem(v, multiline);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}

/** A `?q=` search: optional, at most 100 characters of plain one-line text. */
export const searchQuerySchema = textSchema({ max: 100 }).optional();

// ---- lengths ----------------------------------------------------------------------------------------
// Every length has a plausible upper bound. Fields with a size of their own use plausibleLengthSchema
// (below); every other length stops at 6 m (about 236 in), the largest outside diameter a shop records,
// so a typing slip (or 1e308) is refused on its field and never reaches a computed range.

export const MAX_LENGTH_MM = 6000;
const MAX_LENGTH: Record<(typeof lengthUnits)[number], number> = {
  mm: MAX_LENGTH_MM,
  in: MAX_LENGTH_MM / 25.4,
};

function boundedLength<T extends { value: number; unit: (typeof lengthUnits)[number] }>(
  v: T,
  ctx: z.RefinementCtx,
) {
  const max = MAX_LENGTH[v.unit];
  if (v.value > max)
    ctx.addIssue({
      code: 'custom',
      path: ['value'],
      message: `At most ${v.unit === 'mm' ? `${MAX_LENGTH_MM} mm` : `${Math.floor(max)} in`}`,
    });
}

const lengthUnitSchema = z.enum(lengthUnits, { error: 'Unit must be in or mm' });

export const lengthSchema = z
  .object({
    value: z.number({ error: 'Enter a number' }).nonnegative('A length cannot be negative'),
    unit: lengthUnitSchema,
  })
  .superRefine(boundedLength);

export const positiveLengthSchema = z
  .object({
    value: z.number({ error: 'Enter a number' }).positive('Must be greater than zero'),
    unit: lengthUnitSchema,
  })
  .superRefine(boundedLength);

export const codeIds = ['asme-ix', 'aws-d1.1', 'api-1104', 'iso-9606-1'] as const;
export const codeIdSchema = z.enum(codeIds, {
  error: 'Choose one of ASME IX, AWS D1.1, API 1104, ISO 9606-1',
});
export type CodeId = (typeof codeIds)[number];

export const criteriaIds = [...codeIds, 'shop-general'] as const;
export const criteriaIdSchema = z.enum(criteriaIds, {
  error: 'Choose one of ASME IX, AWS D1.1, API 1104, ISO 9606-1 or shop practice (in-house)',
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
  thickness: {
    what: 'The coupon thickness',
    min: { in: 0.01, mm: 0.25 },
    max: { in: 12, mm: 300 },
    minInclusive: true,
  },
  depositedThickness: {
    what: 'The deposited weld metal thickness',
    min: { in: 0.01, mm: 0.25 },
    max: { in: 12, mm: 300 },
    minInclusive: true,
  },
  outsideDiameter: {
    what: 'The outside diameter',
    min: { in: 0.25, mm: 6 },
    max: { in: 240, mm: 6000 },
    minInclusive: true,
  },
  discontinuity: {
    what: 'A discontinuity',
    min: { in: 0, mm: 0 },
    max: { in: 12, mm: 300 },
    minInclusive: false,
  },
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
