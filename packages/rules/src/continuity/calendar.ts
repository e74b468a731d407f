// Small pure helpers on ISO calendar dates ('YYYY-MM-DD'), no clock and no time zone: a qualification
// date is a day in the shop's calendar, not an instant. ISO date strings compare correctly as strings.

export type IsoDate = string;

const DAY_MS = 86_400_000;

export const isLeapYear = (y: number): boolean => (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;

export function daysInMonth(y: number, m: number): number {
  if (m === 2) return isLeapYear(y) ? 29 : 28;
  return m === 4 || m === 6 || m === 9 || m === 11 ? 30 : 31;
}

// Two to four ASCII digits at s[from..from+n) as a number, or -1. Hand-rolled: continuity checks every
// evidence date on every call, and a regex with captures costs several times more.
function digitsAt(s: string, from: number, n: number): number {
  let v = 0;
  for (let i = from; i < from + n; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

/** A real calendar date written YYYY-MM-DD, year 1900 or later. */
export function isIsoDate(text: string): boolean {
  if (
    typeof text !== 'string' ||
    text.length !== 10 ||
    text.charCodeAt(4) !== 45 ||
    text.charCodeAt(7) !== 45
  )
    return false;
  const y = digitsAt(text, 0, 4);
  const m = digitsAt(text, 5, 2);
  const d = digitsAt(text, 8, 2);
  return y >= 1900 && m >= 1 && m <= 12 && d >= 1 && d <= daysInMonth(y, m);
}

// Callers pass validated dates; slicing is what keeps continuity fast over long evidence lists.
export const yearOf = (d: IsoDate): number => digitsAt(d, 0, 4);
const monthOf = (d: IsoDate): number => digitsAt(d, 5, 2);
const dayOf = (d: IsoDate): number => digitsAt(d, 8, 2);

const pad2 = (n: number): string => (n < 10 ? `0${n}` : String(n));
const pad4 = (n: number): string => String(n).padStart(4, '0');
const format = (y: number, m: number, d: number): IsoDate => `${pad4(y)}-${pad2(m)}-${pad2(d)}`;

/** Add calendar months, clamping at month end: 2025-08-31 + 6 months = 2026-02-28 (29 in a leap year). */
export function addMonths(date: IsoDate, months: number): IsoDate {
  const total = yearOf(date) * 12 + (monthOf(date) - 1) + months;
  const y = Math.floor(total / 12);
  const m = total - y * 12 + 1;
  return format(y, m, Math.min(dayOf(date), daysInMonth(y, m)));
}

export const addYears = (date: IsoDate, years: number): IsoDate => addMonths(date, years * 12);

/** The day number since 1970-01-01 (UTC calendar). */
export const dayNumber = (date: IsoDate): number =>
  Date.UTC(yearOf(date), monthOf(date) - 1, dayOf(date)) / DAY_MS;

export function addDays(date: IsoDate, days: number): IsoDate {
  const t = new Date((dayNumber(date) + days) * DAY_MS);
  return format(t.getUTCFullYear(), t.getUTCMonth() + 1, t.getUTCDate());
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export const daysBetween = (from: IsoDate, to: IsoDate): number => dayNumber(to) - dayNumber(from);

/** The first day of the month that is `months` after the month of `date`: (2025-01-20, 7) → 2025-08-01. */
export function firstOfMonthAfter(date: IsoDate, months: number): IsoDate {
  return addMonths(format(yearOf(date), monthOf(date), 1), months);
}

export const minDate = (a: IsoDate, b: IsoDate): IsoDate => (a <= b ? a : b);

/** January 1 of a year. */
export const firstOfYear = (year: number): IsoDate => `${pad4(year)}-01-01`;
