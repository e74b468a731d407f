// Plausible sizes on a coupon: the same schema refuses typing slips in the form and in the API.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { qualifiedRanges } from '../ranges/qualified-ranges.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { implausibleLength, lengthBounds, plausibleLengthSchema } from './common.js';
import { couponSchema } from './coupon.js';
import { recordedDiscontinuitySchema } from './records.js';

const plate = {
  code: 'asme-ix',
  process: 'SMAW',
  form: 'plate',
  weld: 'groove',
  position: '1G',
  thickness: { value: 0.375, unit: 'in' },
  backing: true,
} as const;

describe('plausible lengths (common practice (no source): coupons run from 0.5 mm sheet to a few inches of plate)', () => {
  it.each([
    [{ value: 1e20, unit: 'in' }, /1e\+20 in is not a plausible size: enter 0.01 in to 12 in/],
    [{ value: 99999999, unit: 'in' }, /The coupon thickness of 99999999 in is not a plausible size/],
    [{ value: 0, unit: 'in' }, /The coupon thickness of 0 in is not a plausible size/],
    [{ value: 400, unit: 'mm' }, /enter 0.25 mm to 300 mm/],
  ] as const)('refuses a coupon thickness of %j and names the field', (thickness, message) => {
    const r = couponSchema.safeParse({ ...plate, thickness });
    expect(r.success).toBe(false);
    const issue = r.error?.issues[0];
    expect(issue?.path).toEqual(['thickness', 'value']);
    expect(issue?.message).toMatch(message);
  });

  it('qualifiedRanges refuses the same slip at the same field', () => {
    try {
      qualifiedRanges({ ...plate, thickness: { value: 99999999, unit: 'in' } });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(RulesInputError);
      expect(Object.keys((e as RulesInputError).fields)).toEqual(['thickness.value']);
    }
  });

  it('accepts 3/8 in plate, NPS 48 pipe and a 1/32 in porosity; refuses a zero or a 20 in discontinuity', () => {
    expect(couponSchema.safeParse({ ...plate, form: 'pipe', position: '6G', outsideDiameter: { value: 48, unit: 'in' } }).success).toBe(true);
    const disc = (value: number) =>
      recordedDiscontinuitySchema.safeParse({ sizeText: String(value), size: { value, unit: 'in' }, location: 'surface' }).success;
    expect(disc(1 / 32)).toBe(true);
    expect(disc(0)).toBe(false);
    expect(disc(20)).toBe(false);
  });

  it('property: a value passes exactly when it lies within the bounds of its own unit', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...Object.values(lengthBounds)),
        fc.constantFrom<'in' | 'mm'>('in', 'mm'),
        fc.double({ min: 0, max: 1e7, noNaN: true }),
        (b, unit, value) => {
          const inside = (b.minInclusive ? value >= b.min[unit] : value > b.min[unit]) && value <= b.max[unit];
          expect(implausibleLength({ value, unit }, b) === null).toBe(inside);
          expect(plausibleLengthSchema(b).safeParse({ value, unit }).success).toBe(inside);
        },
      ),
    );
  });
});
