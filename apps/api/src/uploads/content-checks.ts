// What an accepted file may carry (issue 11, finding 8). A PDF that acts when opened — JavaScript, an
// open action, a launch, embedded files or forms that submit — is refused: a qualification record's
// attachments are documents to read, never programs. An image keeps only its picture: bytes after the
// PNG IEND chunk or the JPEG end-of-image marker (where an HTML or ZIP "polyglot" hides) are cut off.
import { inflateSync } from 'node:zlib';

const ACTIVE_PDF_NAMES = ['JavaScript', 'JS', 'OpenAction', 'AA', 'Launch', 'EmbeddedFile', 'RichMedia', 'SubmitForm', 'ImportData', 'GoToR', 'GoToE'];
const ACTIVE_PDF = new RegExp(`/(${ACTIVE_PDF_NAMES.join('|')})(?![A-Za-z0-9])`);
const MAX_INFLATED = 64 * 1024 * 1024;

/** PDF names may spell letters as #xx; read them as written out. */
const unescapeNames = (s: string) => s.replace(/#([0-9A-Fa-f]{2})/g, (_m, h: string) => String.fromCharCode(parseInt(h, 16)));

/** The active feature a PDF carries (in its plain objects or its compressed object streams), or null. */
export function activePdfContent(pdf: Buffer): string | null {
  const found = (text: string) => ACTIVE_PDF.exec(unescapeNames(text))?.[1] ?? null;
  const raw = pdf.toString('latin1');
  const plain = found(raw);
  if (plain) return plain;
  let inflated = 0;
  const streams = /stream\r?\n/g;
  for (let m = streams.exec(raw); m; m = streams.exec(raw)) {
    const start = m.index + m[0].length;
    const end = raw.indexOf('endstream', start);
    if (end < 0) break;
    try {
      const body = inflateSync(pdf.subarray(start, end), { maxOutputLength: MAX_INFLATED });
      inflated += body.length;
      const hit = found(body.toString('latin1'));
      if (hit) return hit;
    } catch {
      // Not a Flate stream (an image, or already plain): its bytes were read above.
    }
    if (inflated > MAX_INFLATED) return 'too much compressed content';
    streams.lastIndex = end;
  }
  return null;
}

/** A PNG up to the end of its IEND chunk (with its CRC); the file as is when no IEND is found. */
export function pngWithoutTrailer(png: Buffer): Buffer {
  let at = 8; // signature
  while (at + 12 <= png.length) {
    const length = png.readUInt32BE(at);
    const type = png.toString('latin1', at + 4, at + 8);
    const next = at + 12 + length;
    if (type === 'IEND') return next < png.length ? png.subarray(0, next) : png;
    if (next > png.length) return png;
    at = next;
  }
  return png;
}

/**
 * A JPEG up to its end-of-image marker, found by walking the marker segments and the entropy-coded scan
 * data (where 0xFF is followed by 0x00 or a restart marker), so a thumbnail's EOI inside APP1 does not
 * cut the picture short.
 */
export function jpegWithoutTrailer(jpg: Buffer): Buffer {
  let at = 2; // SOI
  while (at + 4 <= jpg.length) {
    if (jpg[at] !== 0xff) return jpg;
    const marker = jpg[at + 1]!;
    if (marker === 0xd9) return at + 2 < jpg.length ? jpg.subarray(0, at + 2) : jpg;
    if (marker === 0xff) {
      at += 1;
      continue;
    }
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) {
      at += 2;
      continue;
    }
    const length = jpg.readUInt16BE(at + 2);
    at += 2 + length;
    if (marker === 0xda) {
      // Scan data: runs until a marker other than a stuffed byte or a restart marker.
      while (at + 1 < jpg.length && !(jpg[at] === 0xff && jpg[at + 1] !== 0x00 && !(jpg[at + 1]! >= 0xd0 && jpg[at + 1]! <= 0xd7)))
        at += 1;
    }
  }
  return jpg;
}
