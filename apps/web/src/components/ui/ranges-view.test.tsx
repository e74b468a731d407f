import { qualifiedRanges } from '@beadroll/rules';
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { intervalWords, rangeLines, RangesView, rangesViewSchema } from './ranges-view';

describe('qualified ranges in plain words', () => {
  // 3/8 in ASME IX plate in 3G with backing: groove F, V; up to 2t = 3/4 in; plate qualifies pipe of
  // 2-7/8 in OD and over (from memory: QW-452.1(b), QW-452.3, QW-461.9).
  const ranges = qualifiedRanges({
    code: 'asme-ix',
    process: 'SMAW',
    form: 'plate',
    weld: 'groove',
    position: '3G',
    thickness: { value: 3 / 8, unit: 'in' },
    backing: true,
    fNumber: 4,
    progression: 'uphill',
  });

  it('reads the stored JSON back and says each range as a person would', () => {
    const stored = rangesViewSchema.parse(JSON.parse(JSON.stringify(ranges)));
    const lines = Object.fromEntries(rangeLines(stored).map((l) => [l.label, l.value]));
    expect(lines['Groove positions']).toBe('F, V (flat, vertical)');
    expect(lines.Thickness).toBe('Up to 3/4 in');
    expect(lines['Pipe diameter']).toBe('2-7/8 in OD and over');
    expect(lines.Backing).toBe('With backing only');
    expect(lines['Vertical progression']).toBe('uphill only');
    expect(intervalWords({ min: null, max: null, minExclusive: false, maxExclusive: false })).toBe('Any (no limit from this code)');
    expect(intervalWords({ min: { value: 2.375, unit: 'in' }, max: { value: 12.75, unit: 'in' }, minExclusive: false, maxExclusive: true })).toBe('2-3/8 in to under 12-3/4 in');
  });

  it('names the clause of every limit and carries the caution', () => {
    render(<RangesView ranges={ranges} />);
    expect(screen.getAllByText('QW-461.9').length).toBeGreaterThan(0);
    expect(screen.getByText('QW-402.4')).toBeTruthy();
    expect(screen.getByText(/responsible inspector govern/)).toBeTruthy();
  });
});
