import convert from 'convert-units';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { RulesInputError } from '../validation/rules-input-error.js';
import {
  formatLength,
  formatLengthBoth,
  inchFraction,
  limitIn,
  parseLength,
  toInches,
  toMm,
  type Length,
} from './length.js';

const inToMm = (v: number): number => convert(v).from('in').to('mm');
const mmToIn = (v: number): number => convert(v).from('mm').to('in');
// convert-units 2.3.4 goes through the foot as 1/3.28084 m, a rounded factor (1 in = 25.3999992 mm), so
// it agrees with the exact international inch to about 3 parts in 100 million, not to the last digit.
const REL = 1e-7;
const expectClose = (actual: number, expected: number): void => {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(REL * Math.max(Math.abs(expected), 1e-12));
};

describe('parseLength', () => {
  it.each([
    ['3/16', 0.1875, 'in'],
    ['3/16"', 0.1875, 'in'],
    ['1-1/4 in', 1.25, 'in'],
    ['1 1/4 in', 1.25, 'in'],
    ['0.125in', 0.125, 'in'],
    ['.5 inch', 0.5, 'in'],
    ['2 inches', 2, 'in'],
    ['3 mm', 3, 'mm'],
    ['3mm', 3, 'mm'],
    ['  3.2 MM ', 3.2, 'mm'],
    ['0', 0, 'in'],
  ] as const)('reads %j as %d %s', (text, value, unit) => {
    const l = parseLength(text);
    expect(l.value).toBe(value);
    expect(l.unit).toBe(unit);
  });

  it('uses the default unit when none is written', () => {
    expect(parseLength('6', 'mm')).toMatchObject({ value: 6, unit: 'mm' });
    expect(parseLength('6')).toMatchObject({ value: 6, unit: 'in' });
    expect(parseLength('6 in', 'mm')).toMatchObject({ value: 6, unit: 'in' });
  });

  it('convert-units 2.3.4 (npm): mm and inches agree with the general-purpose units library', () => {
    for (const text of ['1/8', '3/16 in', '1-1/4 in', '0.154 in', '24 in']) {
      const l = parseLength(text);
      expect(l.inches).toBe(l.value);
      expectClose(l.mm, inToMm(l.value));
    }
    for (const text of ['3 mm', '3.2 mm', '73 mm', '600 mm']) {
      const l = parseLength(text);
      expect(l.mm).toBe(l.value);
      expectClose(l.inches, mmToIn(l.value));
    }
  });

  it('published: international inch of 1959, 1 in = 25.4 mm exactly; 1/8 in = 3.175 mm', () => {
    expect(parseLength('1 in').mm).toBe(25.4);
    expect(parseLength('1/8').mm).toBe(3.175);
    expect(parseLength('25.4 mm').inches).toBe(1);
  });

  it('convert-units 2.3.4 (npm): 1/8 in is about 3.175 mm, larger than the 3 mm SI value the codes give', () => {
    expectClose(parseLength('1/8').mm, inToMm(0.125));
    expect(inToMm(0.125)).toBeGreaterThan(3.1);
    expect(mmToIn(3.1)).toBeLessThan(0.125);
    expect(parseLength('3.1 mm').inches).toBeLessThan(0.125);
  });

  it.each([
    ['', 'empty'],
    ['   ', 'empty'],
    ['-3 mm', 'negative'],
    ['−1/8', 'negative'],
    ['3/0', 'zero denominator'],
    ['1-1/0 in', 'zero denominator'],
    ['three', 'write it like'],
    ['3 ft', 'not a unit'],
    ['3,2 mm', 'decimal separator'],
    ['1/8 1/8', 'not a unit'],
  ])('throws a RangeError with a clear message for %j (%s)', (text, why) => {
    expect(() => parseLength(text)).toThrow(RangeError);
    expect(() => parseLength(text)).toThrow(RulesInputError);
    expect(() => parseLength(text)).toThrow(new RegExp(why));
  });

  it('names the field in the error', () => {
    try {
      parseLength('abc');
      expect.unreachable();
    } catch (e) {
      expect((e as RulesInputError).fields).toHaveProperty('length');
    }
  });
});

describe('formatLength', () => {
  it.each([
    [{ value: 0.1875, unit: 'in' }, '3/16 in'],
    [{ value: 1.25, unit: 'in' }, '1-1/4 in'],
    [{ value: 2.375, unit: 'in' }, '2-3/8 in'],
    [{ value: 24, unit: 'in' }, '24 in'],
    [{ value: 0.154, unit: 'in' }, '0.154 in'],
    [{ value: 3, unit: 'mm' }, '3 mm'],
    [{ value: 3.175, unit: 'mm' }, '3.175 mm'],
  ] as const)('writes %j as %s', (l, text) => {
    expect(formatLength(l)).toBe(text);
  });

  it('rounds decimals when asked and can show both systems', () => {
    expect(formatLength({ value: 0.0937499, unit: 'in' }, { digits: 3 })).toBe('0.094 in');
    expect(formatLength({ value: 0.5, unit: 'in' }, { fractions: false })).toBe('0.5 in');
    expect(formatLengthBoth({ value: 0.125, unit: 'in' })).toBe('1/8 in (3.18 mm)');
  });

  it('writes only exact 64ths as fractions', () => {
    expect(inchFraction(0.015625)).toBe('1/64');
    expect(inchFraction(0.1)).toBeNull();
  });

  it('property: parse of a formatted length round-trips', () => {
    const lengths = fc.oneof(
      fc.record({
        value: fc.integer({ min: 0, max: 64 * 60 }).map((n) => n / 64),
        unit: fc.constant<'in'>('in'),
      }),
      fc.record({
        value: fc.double({ min: 0.001, max: 10000, noNaN: true }),
        unit: fc.constantFrom<'in' | 'mm'>('in', 'mm'),
      }),
    );
    fc.assert(
      fc.property(lengths, (l: Length) => {
        const back = parseLength(formatLength(l));
        expect(back.unit).toBe(l.unit);
        expect(back.value).toBe(l.value);
      }),
    );
  });
});

describe('limitIn and conversions', () => {
  it('uses the code’s own value in each system and converts only a missing one', () => {
    expect(limitIn({ in: 1 / 8, mm: 3 }, 'mm')).toBe(3);
    expect(limitIn({ in: 1 / 8, mm: 3 }, 'in')).toBe(0.125);
    expectClose(limitIn({ mm: 3 }, 'in'), mmToIn(3));
    expectClose(limitIn({ in: 0.25 }, 'mm'), inToMm(0.25));
  });

  it('convert-units 2.3.4 (npm): toMm and toInches', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e4, noNaN: true }), (v) => {
        expectClose(toMm({ value: v, unit: 'in' }), inToMm(v));
        expectClose(toInches({ value: v, unit: 'mm' }), mmToIn(v));
      }),
    );
  });
});
