// Every Beadroll document is set in Source Sans 3, the typeface the app ships. pdfkit embeds the
// fontsource `.woff` files (the `.woff2` ones produce a broken PDF); they are read once per process.
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { inflateSync } from 'node:zlib';
import PDFDocument from 'pdfkit';

export const FONT_REGULAR = 'Beadroll-Regular';
export const FONT_SEMIBOLD = 'Beadroll-Semibold';

const require = createRequire(import.meta.url);

/**
 * Unpacks a WOFF 1.0 file into the plain TrueType/OpenType font it wraps (W3C WOFF File Format 1.0, §4–§6):
 * same tables, same checksums, each one inflated. pdfkit's font engine would otherwise inflate the
 * tables in JavaScript for every document (about 60 ms a document here); node's zlib does it once.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString('latin1', 0, 4) !== 'wOFF') throw new Error('Not a WOFF 1.0 font');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const stored = woff.subarray(offset, offset + compLength);
    const data = compLength < origLength ? inflateSync(stored) : stored;
    if (data.length !== origLength) throw new Error('Damaged WOFF table');
    return { tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data };
  });
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  const headerLength = 12 + numTables * 16;
  const padded = (n: number): number => (n + 3) & ~3;
  const out = Buffer.alloc(headerLength + tables.reduce((sum, t) => sum + padded(t.data.length), 0));
  out.writeUInt32BE(flavor, 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(searchRange, 6);
  out.writeUInt16BE(entrySelector, 8);
  out.writeUInt16BE(numTables * 16 - searchRange, 10);
  let offset = headerLength;
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    out.writeUInt32BE(t.tag, at);
    out.writeUInt32BE(t.checksum, at + 4);
    out.writeUInt32BE(offset, at + 8);
    out.writeUInt32BE(t.data.length, at + 12);
    t.data.copy(out, offset);
    offset += padded(t.data.length);
  });
  return out;
}

type FontFiles = { regular: Buffer; semibold: Buffer };
let files: FontFiles | undefined;

function fontFiles(): FontFiles {
  if (!files) {
    const load = (weight: 400 | 600): Buffer =>
      woffToSfnt(
        readFileSync(
          require.resolve(`@fontsource/source-sans-3/files/source-sans-3-latin-${weight}-normal.woff`),
        ),
      );
    files = { regular: load(400), semibold: load(600) };
  }
  return files;
}

/**
 * A pdfkit document whose only fonts are Source Sans 3 regular and semibold. pdfkit opens a default
 * font in its constructor (its built-in Helvetica unless told otherwise, and then writes it into the
 * file); `font: null` skips that, and the first `font()` call below sets ours before any text.
 */
export function createDocument(options: Omit<PDFKit.PDFDocumentOptions, 'font'>): PDFKit.PDFDocument {
  const f = fontFiles();
  // pdfkit 0.20 reads `font: null` as "no default font" (initFonts only opens one when it is truthy);
  // its types only allow a font name.
  const doc = new PDFDocument({ ...options, font: null as unknown as string });
  doc.registerFont(FONT_REGULAR, f.regular);
  doc.registerFont(FONT_SEMIBOLD, f.semibold);
  doc.font(FONT_REGULAR);
  return doc;
}

/** Collects a finished document into one Buffer. */
export function documentBuffer(doc: PDFKit.PDFDocument, draw: () => void): Promise<Buffer> {
  return new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    try {
      draw();
      doc.end();
    } catch (error) {
      reject(error instanceof Error ? error : new Error(String(error)));
    }
  });
}
