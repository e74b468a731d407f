// Reading what a QA manager uploads: a CSV (papaparse) or an XLSX workbook (exceljs), refused unless the
// content really is one (the name and the browser's type are not trusted). Formulas are read as the value
// the spreadsheet program last computed; dates stored as dates come out as ISO days.
import Papa from 'papaparse';
import ExcelJS from 'exceljs';
import { AppError } from '../lib/errors.js';

export const MAX_IMPORT_BYTES = 20 * 1024 * 1024;
export const MAX_IMPORT_ROWS = 200_000;
/** How much of the start of a file `sniff` reads to tell what it is. */
export const SNIFF_BYTES = 65536;

export interface SheetRow {
  /** The row number a spreadsheet program shows (the header is row 1). */
  line: number;
  cells: string[];
}

export interface Sheet {
  headers: string[];
  /** Data rows (header and blank rows excluded), each as long as the headers, cells trimmed text. */
  rows: SheetRow[];
}

export type FileType = 'csv' | 'xlsx';

const notSpreadsheet = (why: string) =>
  AppError.validation({ file: why }, 'This file is not a spreadsheet Beadroll can read');

/** What the bytes are: an XLSX (a zip with a workbook), a CSV (text), or a refusal naming why. */
export function sniff(bytes: Buffer): FileType {
  if (bytes.length === 0) throw notSpreadsheet('The file is empty');
  if (bytes.subarray(0, 4).equals(Buffer.from([0x50, 0x4b, 0x03, 0x04]))) return 'xlsx';
  if (bytes.subarray(0, 4).equals(Buffer.from([0xd0, 0xcf, 0x11, 0xe0])))
    throw notSpreadsheet('This is an old-style .xls workbook; save it as .xlsx or .csv and upload that');
  if (bytes.subarray(0, 5).toString('latin1') === '%PDF-') throw notSpreadsheet('This is a PDF, not a spreadsheet');
  // Text: no NUL bytes and no other control characters than tab, CR, LF in the first 64 KB.
  const head = bytes.subarray(0, SNIFF_BYTES);
  for (const b of head) if (b < 0x09 || (b > 0x0d && b < 0x20 && b !== 0x1b) || b === 0x7f)
    throw notSpreadsheet('The file holds binary data; upload a .csv or .xlsx file');
  return 'csv';
}

function decodeText(bytes: Buffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes).replace(/^\uFEFF/, '');
  } catch {
    // Spreadsheet programs on Windows save CSV in the Windows-1252 code page unless told otherwise.
    return new TextDecoder('windows-1252').decode(bytes);
  }
}

function tidy(headers: string[], rows: SheetRow[]): Sheet {
  const width = headers.length;
  if (width === 0 || headers.every((h) => h === '')) throw notSpreadsheet('The first row must hold the column headers');
  const seen = new Set<string>();
  headers.forEach((h, i) => {
    if (h === '') headers[i] = `Column ${i + 1}`;
    if (seen.has(headers[i]!.toLowerCase())) headers[i] = `${headers[i]} (${i + 1})`;
    seen.add(headers[i]!.toLowerCase());
  });
  const data = rows
    .filter((r) => r.cells.some((c) => c !== ''))
    .map((r) => ({ line: r.line, cells: Array.from({ length: width }, (_, i) => r.cells[i] ?? '') }));
  if (data.length > MAX_IMPORT_ROWS)
    throw AppError.validation({ file: `At most ${MAX_IMPORT_ROWS.toLocaleString('en-US')} rows in one file; split it` });
  return { headers, rows: data };
}

export function readCsv(bytes: Buffer): Sheet {
  const text = decodeText(bytes);
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: false, delimiter: '' });
  const records = parsed.data.map((cells, i) => ({ line: i + 1, cells: cells.map((c) => c.trim()) }));
  const headerAt = records.findIndex((r) => r.cells.some((c) => c !== ''));
  if (headerAt < 0) throw notSpreadsheet('The file has no rows');
  return tidy(records[headerAt]!.cells, records.slice(headerAt + 1));
}

const isoDay = (d: Date) => d.toISOString().slice(0, 10);

/** The text of one cell as the spreadsheet shows its value (a formula's last computed result). */
function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return '';
  if (value instanceof Date) return isoDay(value);
  if (typeof value === 'object') {
    if ('result' in value) return cellText(value.result); // formula or shared formula
    if ('richText' in value) return value.richText.map((t) => t.text).join('');
    if ('text' in value) return String(value.text); // hyperlink
    if ('error' in value) return '';
    return '';
  }
  return String(value).trim();
}

export async function readXlsx(bytes: Buffer): Promise<Sheet> {
  const workbook = new ExcelJS.Workbook();
  try {
    await workbook.xlsx.load(bytes as unknown as ArrayBuffer);
  } catch {
    throw notSpreadsheet('The file is a zip but not an .xlsx workbook this program can read');
  }
  const sheet = workbook.worksheets.find((w) => w.actualRowCount > 0);
  if (!sheet) throw notSpreadsheet('The workbook has no rows');
  const rows: SheetRow[] = [];
  sheet.eachRow({ includeEmpty: false }, (row, line) => {
    const values = row.values as ExcelJS.CellValue[]; // 1-based
    rows.push({ line, cells: Array.from({ length: Math.max(values.length - 1, 0) }, (_, i) => cellText(values[i + 1])) });
  });
  const [first, ...rest] = rows;
  if (!first) throw notSpreadsheet('The workbook has no rows');
  return tidy(first.cells, rest);
}

export async function readSpreadsheet(bytes: Buffer): Promise<{ type: FileType; sheet: Sheet }> {
  if (bytes.length > MAX_IMPORT_BYTES) throw new AppError('payload_too_large', 'The file is larger than 20 MB; split it');
  const type = sniff(bytes);
  return { type, sheet: type === 'xlsx' ? await readXlsx(bytes) : readCsv(bytes) };
}
