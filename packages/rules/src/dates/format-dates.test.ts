import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatDay, formatInstant, formatInstantDay } from './format-dates.js';

describe('formatDay', () => {
  it('keeps the ISO date for tables and writes the month in words for prose', () => {
    expect(formatDay('2026-03-04')).toBe('2026-03-04');
    expect(formatDay('2026-03-04', 'long')).toBe('4 March 2026');
  });
  it('refuses what is not a calendar day', () => {
    expect(() => formatDay('2026-02-30')).toThrow(RangeError);
    expect(() => formatDay('04/03/2026', 'long')).toThrow(RangeError);
  });
  it('reads every day of the calendar back to the same day in both styles', () => {
    fc.assert(
      fc.property(fc.date({ min: new Date('1950-01-01'), max: new Date('2150-12-31'), noInvalidDate: true }), (d) => {
        const day = d.toISOString().slice(0, 10);
        expect(formatDay(day)).toBe(day);
        const long = formatDay(day, 'long');
        expect(long).toContain(String(d.getUTCFullYear()));
        expect(long.startsWith(`${d.getUTCDate()} `)).toBe(true);
      }),
    );
  });
});

describe('formatInstant', () => {
  it('reads an instant on the company clock, not UTC', () => {
    // 03:30 UTC on 1 June is still 31 May in Chicago (UTC-5 in summer).
    expect(formatInstant('2026-06-01T03:30:00Z', 'America/Chicago')).toBe('2026-05-31 22:30');
    expect(formatInstant('2026-06-01T03:30:00Z', 'America/Chicago', 'long')).toBe('31 May 2026 at 22:30');
    expect(formatInstantDay('2026-06-01T03:30:00Z', 'America/Chicago')).toBe('2026-05-31');
    expect(formatInstantDay('2026-06-01T03:30:00Z', 'Europe/Berlin', 'long')).toBe('1 June 2026');
  });
  it('gives back what it cannot read', () => {
    expect(formatInstant('not a time', 'UTC')).toBe('not a time');
  });
});
