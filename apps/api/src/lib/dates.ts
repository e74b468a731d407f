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

/**
 * The IANA time zone of the server process (TZ, else the system's), the default of every company. Read
 * once per value of TZ: resolving it builds a formatter (tens of microseconds) and it was asked on every
 * request. Node re-reads its zone only when TZ is assigned, so the cache keyed by TZ is exact.
 */
let serverZone: { tz: string | undefined; zone: string } | null = null;
export function serverTimeZone(): string {
  // TZ is the runtime's own zone setting (config.ts reads the app's configuration).
  const tz = process.env.TZ;
  if (serverZone?.tz !== tz || serverZone === null)
    serverZone = { tz, zone: Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC' };
  return serverZone.zone;
}

const knownZones = new Map<string, boolean>();
/** True when `timeZone` is an IANA zone name this runtime knows (remembered: the runtime's list is fixed). */
export function isTimeZone(timeZone: string): boolean {
  let known = knownZones.get(timeZone);
  if (known === undefined) {
    try {
      new Intl.DateTimeFormat('en', { timeZone });
      known = timeZone.length > 0;
    } catch {
      known = false;
    }
    if (knownZones.size < 1000) knownZones.set(timeZone, known);
  }
  return known;
}
