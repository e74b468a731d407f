// The project's text and length schemas: what every text field and every length accepts.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  lengthSchema,
  positiveLengthSchema,
  searchQuerySchema,
  TEXT_CONTROL_MESSAGE,
  TEXT_SURROGATE_MESSAGE,
  textProblem,
  textSchema,
} from './common.js';
import { couponSchema } from './coupon.js';

const name = textSchema({ max: 120, min: 1 });
const note = textSchema({ max: 500, multiline: true });

// common practice (no source): PostgreSQL text cannot hold NUL (error 22021) and a lone UTF-16 surrogate
// cannot be encoded as UTF-8 (22P05 / 22021); C0/C1 controls have no printed form on a record.
const controls = [
  ...Array.from({ length: 32 }, (_, i) => String.fromCharCode(i)),
  ...Array.from({ length: 33 }, (_, i) => String.fromCharCode(0x7f + i)),
];

describe('textSchema', () => {
  it('refuses NUL and every other control character in one-line text, naming the problem', () => {
    for (const c of controls) {
      const res = name.safeParse(`Ada${c}Lovelace`);
      expect(res.success, JSON.stringify(c)).toBe(false);
      expect(res.error?.issues[0]?.message).toBe(TEXT_CONTROL_MESSAGE);
    }
  });

  it('lets notes keep tab, line feed and carriage return but nothing else of C0/C1', () => {
    expect(note.parse('line one\r\n\tline two')).toBe('line one\r\n\tline two');
    for (const c of controls.filter((c) => !'\t\n\r'.includes(c)))
      expect(note.safeParse(`a${c}b`).success, JSON.stringify(c)).toBe(false);
  });

  it('refuses half of a surrogate pair wherever it stands, and keeps whole pairs', () => {
    for (const s of ['\uD800', 'a\uD83D', '\uDE00b', 'x\uDE00\uD83D', '\uD83D\uD83D'])
      expect(name.safeParse(s).error?.issues[0]?.message, JSON.stringify(s)).toBe(TEXT_SURROGATE_MESSAGE);
    expect(name.parse('Søren 😀 Ødegård')).toBe('Søren 😀 Ødegård');
  });

  it('accepts every well-formed string without controls (property)', () => {
    const printable = fc
      .string({ unit: 'grapheme', maxLength: 60 })
      // eslint-disable-next-line no-control-regex
      .filter((s) => !/[\u0000-\u001f\u007f-\u009f]/.test(s) && s.trim().length > 0);
    fc.assert(
      fc.property(printable, (s) => {
        expect(textProblem(s)).toBeNull();
        expect(name.safeParse(s).success).toBe(s.trim().length <= 120);
      }),
      { numRuns: 300 },
    );
  });

  it('refuses any string once a NUL or a lone surrogate is inserted (property)', () => {
    fc.assert(
      fc.property(
        fc.string({ unit: 'grapheme', maxLength: 30 }),
        fc.nat(),
        fc.constantFrom('\u0000', '\uD800', '\uDFFF', '\u001b'),
        (s, at, bad) => {
          const i = at % (s.length + 1);
          // Inserting inside an existing pair would make two lone halves: still refused.
          const hostile = `${s.slice(0, i)}${bad}${s.slice(i)}x`;
          expect(textProblem(hostile, true)).not.toBeNull();
        },
      ),
      { numRuns: 300 },
    );
  });

  it('bounds the length and trims; a search query is optional', () => {
    expect(name.safeParse('x'.repeat(121)).error?.issues[0]?.message).toBe('At most 120 characters');
    expect(name.safeParse('   ').error?.issues[0]?.message).toBe('Required');
    expect(searchQuerySchema.parse(undefined)).toBeUndefined();
    expect(searchQuerySchema.safeParse('ab\u0000').success).toBe(false);
  });
});

describe('lengths', () => {
  it('refuses 1e308 and anything above 6 m on the value field, in either unit', () => {
    // common practice (no source): no length a shop records for a welder's test exceeds 6 m.
    for (const schema of [lengthSchema, positiveLengthSchema]) {
      for (const bad of [
        { value: 1e308, unit: 'mm' },
        { value: 6000.1, unit: 'mm' },
        { value: 237, unit: 'in' },
      ]) {
        const res = schema.safeParse(bad);
        expect(res.success, JSON.stringify(bad)).toBe(false);
        expect(res.error?.issues[0]?.path).toEqual(['value']);
      }
      expect(schema.parse({ value: 6000, unit: 'mm' })).toEqual({ value: 6000, unit: 'mm' });
      expect(schema.parse({ value: 236, unit: 'in' })).toEqual({ value: 236, unit: 'in' });
    }
  });

  it('names the coupon field that is too long', () => {
    const res = couponSchema.safeParse({
      code: 'asme-ix',
      process: 'SMAW',
      form: 'plate',
      weld: 'groove',
      position: '3G',
      thickness: { value: 1e308, unit: 'mm' },
      backing: true,
    });
    expect(res.error?.issues.map((i) => i.path.join('.'))).toEqual(['thickness.value']);
  });
});
