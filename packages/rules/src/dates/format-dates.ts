// How every screen, PDF and e-mail writes a date: one helper, so a date never appears in two formats.
// Tables show the ISO date (2026-03-14, sortable, never read two ways); prose and PDFs show the long form
// in the company's locale (14 March 2026). Instants (a sign-in, a run, an audit row) are read on the
// company's wall clock (its time zone in Settings), never the browser's or the server's.

/** The company's locale for the long form: day, month in words, year, so 03/04 is never read two ways. */
export const COMPANY_LOCALE = 'en-GB';

export type DateStyle = 'table' | 'long';

const ISO_DAY = /^(\d{4})-(\d{2})-(\d{2})$/;

const cache = new Map<string, Intl.DateTimeFormat>();
function formatter(key: string, make: () => Intl.DateTimeFormat): Intl.DateTimeFormat {
  let f = cache.get(key);
  if (!f) {
    f = make();
    cache.set(key, f);
  }
  return f;
}

function parts(f: Intl.DateTimeFormat, at: Date): Record<string, string> {
  return Object.fromEntries(f.formatToParts(at).map((p) => [p.type, p.value]));
}

/** A calendar day (YYYY-MM-DD): the ISO date in tables, "14 March 2026" in prose. */
export function formatDay(day: string, style: DateStyle = 'table'): string {
  const m = ISO_DAY.exec(day);
  if (!m) throw new RangeError(`"${day}" is not a date (YYYY-MM-DD)`);
  const at = new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3])));
  if (Number.isNaN(at.getTime()) || at.toISOString().slice(0, 10) !== day)
    throw new RangeError(`"${day}" is not a date (YYYY-MM-DD)`);
  if (style === 'table') return day;
  return formatter('long-day', () =>
    new Intl.DateTimeFormat(COMPANY_LOCALE, { timeZone: 'UTC', day: 'numeric', month: 'long', year: 'numeric' }),
  ).format(at);
}

/**
 * An instant (a Date or an ISO timestamp) on the company's wall clock: "2026-03-14 09:30" in tables,
 * "14 March 2026 at 09:30" in prose. An unreadable value comes back as it is.
 */
export function formatInstant(value: string | Date, timeZone: string, style: DateStyle = 'table'): string {
  const at = typeof value === 'string' ? new Date(value) : value;
  if (Number.isNaN(at.getTime())) return String(value);
  const p = parts(
    formatter(`clock:${timeZone}`, () =>
      new Intl.DateTimeFormat('en-CA', {
        timeZone,
        year: 'numeric',
        month: '2-digit',
        day: '2-digit',
        hour: '2-digit',
        minute: '2-digit',
        hourCycle: 'h23',
      }),
    ),
    at,
  );
  const day = `${p.year}-${p.month}-${p.day}`;
  const time = `${p.hour}:${p.minute}`;
  return style === 'table' ? `${day} ${time}` : `${formatDay(day, 'long')} at ${time}`;
}

/** The calendar day of an instant on the company's wall clock, formatted like `formatDay`. */
export function formatInstantDay(value: string | Date, timeZone: string, style: DateStyle = 'table'): string {
  const text = formatInstant(value, timeZone, 'table');
  return ISO_DAY.test(text.slice(0, 10)) && text.length > 10 ? formatDay(text.slice(0, 10), style) : text;
}
