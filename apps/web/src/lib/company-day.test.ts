import { describe, expect, it } from 'vitest';
import { companyMonth, companyToday } from './company-day';

describe("the company's day", () => {
  // published: IANA tz database — America/Chicago is UTC−6 in winter, Australia/Sydney UTC+11 in summer.
  const at = new Date('2026-12-01T03:30:00Z');
  it('is the day on the company’s wall clock, not UTC’s', () => {
    expect(companyToday('America/Chicago', at)).toBe('2026-11-30');
    expect(companyToday('Australia/Sydney', at)).toBe('2026-12-01');
    expect(companyToday('UTC', at)).toBe('2026-12-01');
  });
  it('gives the month the grid opens on', () => {
    expect(companyMonth('America/Chicago', at)).toBe('2026-11');
    expect(companyMonth('Australia/Sydney', new Date('2026-11-30T13:30:00Z'))).toBe('2026-12');
  });
});
