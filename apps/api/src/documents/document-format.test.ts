import { describe, expect, it } from 'vitest';
import type { Length, QualifiedRangesData } from './document-data.js';
import {
  formatDate,
  formatDiameterRange,
  formatFNumbers,
  formatPositions,
  formatThicknessRange,
} from './document-format.js';

type Ends = { min: Length | null; max?: Length | null; minExclusive?: boolean; maxExclusive?: boolean };
const interval = (e: Ends) => ({ max: null, minExclusive: false, maxExclusive: false, ...e });
const ranges = (thickness: Ends, diameter: Ends = { min: null }): QualifiedRangesData => ({
  positions: { groove: [], fillet: [] },
  thickness: interval(thickness),
  diameter: interval(diameter),
  fNumbers: [],
  backing: [],
  progression: null,
  limits: [],
});
const inch = (value: number): Length => ({ value, unit: 'in' });

describe('range formatting', () => {
  it('puts open ends into words, each end in the unit recorded', () => {
    expect(formatThicknessRange(ranges({ min: inch(0.125), max: inch(0.75) }))).toBe('1/8 in to 3/4 in');
    expect(
      formatThicknessRange(ranges({ min: { value: 3, unit: 'mm' }, max: { value: 20, unit: 'mm' } })),
    ).toBe('3 mm to 20 mm');
    expect(formatThicknessRange(ranges({ min: inch(0.125), max: null }))).toBe('1/8 in and over');
    expect(formatThicknessRange(ranges({ min: null, max: inch(0.188), maxExclusive: true }))).toBe(
      'under 0.188 in',
    );
    expect(formatThicknessRange(ranges({ min: inch(0.75), max: null, minExclusive: true }))).toBe(
      'over 3/4 in',
    );
    expect(formatThicknessRange(ranges({ min: null, max: null }))).toBe('any thickness');
    expect(formatDiameterRange(ranges({ min: null }, { min: inch(2.875) }))).toBe('2-7/8 in OD and over');
    expect(formatDiameterRange(ranges({ min: null }))).toBe('any diameter');
  });

  it('lists positions in F, H, V, O order and F-Numbers in number order', () => {
    expect(formatPositions(['O', 'F', 'V', 'H'])).toBe('F, H, V, O (all)');
    expect(formatPositions(['H', 'F'])).toBe('F, H');
    expect(formatPositions([])).toBe('none');
    expect(formatFNumbers([4, 1, 3, 2])).toBe('F-No. 1, 2, 3, 4');
  });

  it('writes dates with the month in words', () => {
    expect(formatDate('2025-03-04')).toBe('4 Mar 2025');
    expect(() => formatDate('2025-13-40')).toThrow(RangeError);
  });
});
