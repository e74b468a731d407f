// Reading one cell as the trade writes it: dates in the format the QA manager chose, months, and which of
// the file's headers is which of our fields.
import type { ImportDateFormat, ImportField, ImportMapping } from '@beadroll/rules';

const pad = (n: number) => String(n).padStart(2, '0');

function validDay(y: number, m: number, d: number): string | null {
  if (y < 1900 || y > 2200 || m < 1 || m > 12 || d < 1) return null;
  const date = new Date(Date.UTC(y, m - 1, d));
  if (date.getUTCMonth() !== m - 1) return null; // 31 April and the like
  return `${y}-${pad(m)}-${pad(d)}`;
}

const year = (y: string) => (y.length === 2 ? 2000 + Number(y) : Number(y));

/**
 * An ISO day from a cell, or null. YYYY-MM-DD is read as ISO whatever the choice (it is unambiguous);
 * slashed, dashed or dotted day-month-year forms only in the chosen order. Two-digit years are 20xx.
 */
export function parseDay(text: string, format: ImportDateFormat): string | null {
  const t = text.trim();
  let m = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ].*)?$/.exec(t);
  if (m) return validDay(Number(m[1]), Number(m[2]), Number(m[3]));
  if (format === 'iso') return null;
  m = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4}|\d{2})$/.exec(t);
  if (!m) return null;
  const [a, b] = [Number(m[1]), Number(m[2])];
  return format === 'us' ? validDay(year(m[3]!), a, b) : validDay(year(m[3]!), b, a);
}

/** A month (YYYY-MM or M/YYYY, MM.YYYY) as its first ISO day, or null. */
export function parseMonth(text: string): string | null {
  const t = text.trim();
  let m = /^(\d{4})-(\d{1,2})$/.exec(t);
  if (m) return validDay(Number(m[1]), Number(m[2]), 1);
  m = /^(\d{1,2})[/.](\d{4})$/.exec(t);
  if (m) return validDay(Number(m[2]), Number(m[1]), 1);
  return null;
}

export const dateHint: Record<ImportDateFormat, string> = {
  iso: 'YYYY-MM-DD, e.g. 2026-03-31',
  us: 'month/day/year, e.g. 3/31/2026',
  'day-first': 'day/month/year, e.g. 31/03/2026',
};

const norm = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');

/**
 * A mapping for a file: the company's saved mapping where its headers are in the file, then the obvious
 * matches by name (a header equal to a field's key, label or alias); anything else stays unmapped.
 */
export function suggestMapping(
  fields: (ImportField & { aliases: string[] })[],
  headers: string[],
  saved: ImportMapping | null,
): ImportMapping {
  const byNorm = new Map(headers.map((h) => [norm(h), h]));
  const taken = new Set<string>();
  const out: ImportMapping = {};
  for (const f of fields) {
    const fromSaved = saved?.[f.key];
    if (fromSaved && headers.includes(fromSaved) && !taken.has(fromSaved)) {
      out[f.key] = fromSaved;
      taken.add(fromSaved);
      continue;
    }
    const hit = [f.key, f.label, ...f.aliases].map((n) => byNorm.get(norm(n))).find((h) => h && !taken.has(h));
    out[f.key] = hit ?? null;
    if (hit) taken.add(hit);
  }
  return out;
}

