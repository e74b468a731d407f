import {
  addMonths as dfAddMonths,
  addDays as dfAddDays,
  differenceInCalendarDays,
  formatISO,
  parseISO,
} from 'date-fns';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  addDays,
  addMonths,
  addYears,
  daysBetween,
  daysInMonth,
  firstOfMonthAfter,
  isIsoDate,
  isLeapYear,
} from './calendar.js';

const iso = (d: Date): string => formatISO(d, { representation: 'date' });
const arbDate = fc
  .date({ min: new Date(1950, 0, 1), max: new Date(2150, 11, 31), noInvalidDate: true })
  .map((d) => iso(d));

describe('calendar months clamp at month end', () => {
  it('common practice (no source): Aug 31 + 6 months = Feb 28, or Feb 29 in a leap year', () => {
    expect(addMonths('2025-08-31', 6)).toBe('2026-02-28');
    expect(addMonths('2023-08-31', 6)).toBe('2024-02-29');
    expect(addMonths('2024-02-29', 12)).toBe('2025-02-28');
    expect(addYears('2024-02-29', 3)).toBe('2027-02-28');
    expect(addYears('2024-02-29', 4)).toBe('2028-02-29');
    expect(addMonths('2025-03-31', 1)).toBe('2025-04-30');
    expect(addMonths('2025-12-15', 7)).toBe('2026-07-15');
  });

  it('common practice (no source): Gregorian leap years — 2000 is, 1900 and 2100 are not', () => {
    expect([1900, 2000, 2023, 2024, 2100].map(isLeapYear)).toEqual([false, true, false, true, false]);
    expect(daysInMonth(2024, 2)).toBe(29);
    expect(daysInMonth(2100, 2)).toBe(28);
  });

  it('date-fns 4.4.0 (npm): addMonths clamps the same way', () => {
    fc.assert(
      fc.property(arbDate, fc.integer({ min: 0, max: 48 }), (d, n) => {
        expect(addMonths(d, n)).toBe(iso(dfAddMonths(parseISO(d), n)));
      }),
    );
  });

  it('date-fns 4.4.0 (npm): addDays and day differences agree', () => {
    fc.assert(
      fc.property(arbDate, fc.integer({ min: -400, max: 400 }), arbDate, (d, n, other) => {
        expect(addDays(d, n)).toBe(iso(dfAddDays(parseISO(d), n)));
        expect(daysBetween(d, other)).toBe(differenceInCalendarDays(parseISO(other), parseISO(d)));
      }),
    );
  });

  it('firstOfMonthAfter counts whole months from the first of the month', () => {
    expect(firstOfMonthAfter('2025-01-31', 7)).toBe('2025-08-01');
    expect(firstOfMonthAfter('2025-07-01', 7)).toBe('2026-02-01');
  });

  it('isIsoDate accepts only real dates written YYYY-MM-DD', () => {
    for (const ok of ['2024-02-29', '2025-12-31', '1900-01-01']) expect(isIsoDate(ok)).toBe(true);
    for (const bad of [
      '2025-02-29',
      '2025-13-01',
      '2025-04-31',
      '2025-1-01',
      '2025/01/01',
      '1899-12-31',
      '',
      '2025-01-01T00:00',
    ])
      expect(isIsoDate(bad)).toBe(false);
  });
});
