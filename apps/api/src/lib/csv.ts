// Every CSV Beadroll hands out is written here (papaparse's writer), so no cell a person typed can run as a
// formula when the file is opened in a spreadsheet program: text starting with =, +, -, @, a tab or a
// carriage return gets a leading apostrophe (papaparse's escapeFormulae) and is quoted. Numbers and dates
// the registry computed are written as they are.
import Papa from 'papaparse';

export const CSV_CONTENT_TYPE = 'text/csv; charset=utf-8';

export type CsvCell = string | number | boolean | null | undefined;

const OPTIONS = { escapeFormulae: true, newline: '\r\n', header: false } as const;

/** One line of a CSV, ending in CRLF. */
const blank = (cells: readonly CsvCell[]) => cells.map((c) => (c === null || c === undefined ? '' : c));

export function csvLine(cells: readonly CsvCell[]): string {
  return `${Papa.unparse([blank(cells)], OPTIONS)}\r\n`;
}

/** A whole CSV: the header, then each row (one pass of the writer). */
export function toCsv(header: readonly string[], rows: Iterable<readonly CsvCell[]>): string {
  return `${Papa.unparse([blank(header), ...[...rows].map(blank)], OPTIONS)}\r\n`;
}

