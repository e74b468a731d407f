import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvLine, toCsv } from './csv.js';

const TRIGGER = /^[=+\-@\t\r]/;

describe('the CSV writer (common practice (no source): OWASP CSV injection guidance)', () => {
  it('writes a cell starting with =, +, -, @ behind an apostrophe, quoted', () => {
    expect(csvLine(['=HYPERLINK("http://x","y")', '+1', '-2+3', '@SUM(A1)', 'plain', 12, -4, null])).toBe(
      `"'=HYPERLINK(""http://x"",""y"")","'+1","'-2+3","'@SUM(A1)",plain,12,-4,\r\n`,
    );
  });

  it('reads back every text exactly, apart from that apostrophe, and never hands out a formula', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ unit: 'grapheme' }), { minLength: 1, maxLength: 6 }), (cells) => {
        const text = toCsv(['a'], [cells]);
        const [, row] = Papa.parse<string[]>(text, { newline: '\r\n' }).data;
        expect(row).toEqual(cells.map((c) => (TRIGGER.test(c) ? `'${c}` : c)));
        for (const c of row!) expect(TRIGGER.test(c)).toBe(false);
      }),
    );
  });
});
