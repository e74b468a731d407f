import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { toMm } from '../units/length.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { qualifiedRanges } from './qualified-ranges.js';
import { narrowToPaper, parseFNumbers, parsePositions, parseStatedInterval, rangeDifferences } from './paper-ranges.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
// from memory: QW-461.9, QW-452.1(b), QW-452.3 — ASME plate 3G, 3/8 in, SMAW with backing: groove F, V;
// thickness up to 2t = 3/4 in; pipe 2-7/8 in OD and over.
const plate3G = qualifiedRanges({
  code: 'asme-ix',
  process: 'SMAW',
  form: 'plate',
  weld: 'groove',
  position: '3G',
  thickness: inch(0.375),
  backing: true,
  fNumber: 4,
  progression: 'uphill',
});

describe('reading a paper WPQ’s ranges (common practice (no source): how shops write them)', () => {
  it.each([
    ['F, V', ['F', 'V']],
    ['flat and vertical', ['F', 'V']],
    ['V/F', ['F', 'V']],
    ['All', ['F', 'H', 'V', 'O']],
  ])('positions %j', (text, expected) => {
    expect(parsePositions(text)).toEqual(expected);
  });

  it.each([
    ['1/8 to 3/4 in', { min: inch(0.125), max: inch(0.75) }],
    ['up to 3/4"', { min: null, max: inch(0.75) }],
    ['max 19 mm', { min: null, max: { value: 19, unit: 'mm' } }],
    ['2-7/8 in and over', { min: inch(2.875), max: null }],
    ['min 1 in OD', { min: inch(1), max: null }],
    ['0 - 1-1/2 in', { min: null, max: inch(1.5) }],
    ['unlimited', { min: null, max: null }],
  ])('size range %j', (text, expected) => {
    expect(parseStatedInterval(text, 'thickness')).toEqual(expected);
  });

  it.each([
    ['1-4', [1, 2, 3, 4]],
    ['F4, F3', [3, 4]],
    ['F-No. 4 and below', [1, 2, 3, 4]],
  ])('F-Nos. %j', (text, expected) => {
    expect(parseFNumbers(text)).toEqual(expected);
  });

  it('names the variable it cannot read', () => {
    expect(fieldsThrown(() => parsePositions('1G and 2G'))).toContain('groovePositions');
    expect(fieldsThrown(() => parseStatedInterval('thick', 'thickness'))).toContain('thickness');
    expect(fieldsThrown(() => parseFNumbers('E7018'))).toContain('fNumbers');
  });
});

describe('paper record against the computed ranges', () => {
  it('from memory: QW-461.9, QW-452.1(b) — a record that agrees (written its own way, 19 mm for 3/4 in) shows no difference', () => {
    expect(plate3G.positions.groove).toEqual(['F', 'V']);
    expect(
      rangeDifferences(plate3G, { groovePositions: 'flat, vertical', thickness: 'max 19 mm', diameter: '2-7/8 in and over' }),
    ).toEqual([]);
  });

  it('from memory: QW-461.9, QW-452.1(b) — a record claiming more and one claiming less are both differences, named with both sides', () => {
    const d = rangeDifferences(plate3G, { groovePositions: 'All', thickness: 'up to 1/2 in' });
    expect(d).toEqual([
      { variable: 'groovePositions', label: 'Groove positions', computed: 'F, V', stated: 'All' },
      { variable: 'thickness', label: 'Thickness', computed: 'up to 0.75 in', stated: 'up to 1/2 in' },
    ]);
  });

  it('from memory: QW-461.9 — narrowing keeps what both allow and names the paper record', () => {
    const n = narrowToPaper(plate3G, { groovePositions: 'All', thickness: 'up to 1/2 in' }, 'Q. Assay');
    expect(n.positions.groove).toEqual(['F', 'V']); // never wider than the rules
    expect(n.thickness.max).toEqual(inch(0.5));
    expect(n.limits.filter((l) => l.clause.startsWith('paper WPQ record'))).toHaveLength(2);
  });

  it('common practice (no source): narrowing never qualifies more than the computed ranges, whatever the paper says', () => {
    const pos = fc.subarray(['F', 'H', 'V', 'O']).map((p) => (p.length ? p.join(', ') : 'none'));
    const size = fc.integer({ min: 1, max: 64 }).map((n) => `up to ${n}/16 in`);
    fc.assert(
      fc.property(pos, size, (groovePositions, thickness) => {
        const n = narrowToPaper(plate3G, { groovePositions, thickness }, 'x');
        expect(n.positions.groove.every((p) => plate3G.positions.groove.includes(p))).toBe(true);
        expect(toMm(n.thickness.max!)).toBeLessThanOrEqual(toMm(plate3G.thickness.max!) + 1e-9);
      }),
    );
  });
});
