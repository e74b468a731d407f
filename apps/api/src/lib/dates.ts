// Calendar days as the API stores and compares them: ISO dates (YYYY-MM-DD). A "day" belongs to a place:
// a company's today is the date on its own wall clock (its time zone in Settings), never the UTC date of
// the server nor the server's local date. `isoDay` is the UTC date of an instant, for storage keys only.
import type { Clock } from './context.js';

export const isoDay = (at: Date): string => at.toISOString().slice(0, 10);

const formatters = new Map<string, Intl.DateTimeFormat>();
function wallClock(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    // en-CA with numeric parts gives the fields we read below; hourCycle h23 keeps midnight as 00.
    f = new Intl.DateTimeFormat('en-CA', {
      timeZone,
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      hourCycle: 'h23',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** The date and time (HH:MM) on the wall clock of `timeZone` at the instant `at`. */
export function wallTimeIn(timeZone: string, at: Date): { day: string; hhmm: string } {
  const parts = Object.fromEntries(wallClock(timeZone).formatToParts(at).map((p) => [p.type, p.value]));
  return { day: `${parts.year}-${parts.month}-${parts.day}`, hhmm: `${parts.hour}:${parts.minute}` };
}

/** The calendar day in `timeZone` at `at` (a Date) or at the clock's now. */
export function todayIn(timeZone: string, at: Date | Clock): string {
  return wallTimeIn(timeZone, at instanceof Date ? at : at.now()).day;
}

/** The IANA time zone of the server process (TZ, else the system's), the default of every company. */
export function serverTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

/** True when `timeZone` is an IANA zone name this runtime knows. */
export function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone });
    return timeZone.length > 0;
  } catch {
    return false;
  }
}
