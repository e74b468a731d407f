// The upload checks read a file as it streams in: whatever the chunks, the verdict and the bytes kept
// are those of the whole file (property tests, fast-check). Sources: the PDF file structure
// (published: ISO 32000-1, 7.3.8 stream objects, 7.3.5 names with #xx escapes), PNG chunk layout
// (published: W3C PNG specification, 5.3 chunk layout, IEND), JPEG markers (published: ITU-T T.81, B.1.1.3,
// EOI 0xFFD9, stuffed 0xFF00 and RSTn in scan data).
import { deflateSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { JpegCutter, PdfScanner, PngCutter, activePdfContent } from './content-checks.js';

const latin1 = (s: string) => Buffer.from(s, 'latin1');
const compressedObject = (n: number, text: string) =>
  Buffer.concat([
    latin1(`${n} 0 obj\n<< /Filter /FlateDecode /Length 99 >>\nstream\n`),
    deflateSync(latin1(text)),
    latin1('\nendstream\nendobj\n'),
  ]);
const pdfOf = (...parts: Buffer[]) =>
  Buffer.concat([latin1('%PDF-1.5\n'), ...parts, latin1('trailer\n<< >>\n%%EOF\n')]);

/** Splits a buffer at the given cut points. */
const split = (bytes: Buffer, cuts: number[]) => {
  const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
  const out: Buffer[] = [];
  let at = 0;
  for (const p of [...points, bytes.length]) {
    out.push(bytes.subarray(at, p));
    at = p;
  }
  return out;
};

async function scanChunks(chunks: Buffer[]) {
  const scanner = new PdfScanner();
  for (const c of chunks) await scanner.push(c);
  return scanner.end();
}

describe('PDF active content, read as a stream', () => {
  it('finds JavaScript in the second compressed stream, not only the first (common practice (no source))', async () => {
    const file = pdfOf(
      compressedObject(1, '<< /Type /Pages >>'),
      compressedObject(2, '<< /S /JavaScript /JS (x) >>'),
    );
    expect(await activePdfContent(file)).toBe('JavaScript');
    expect(
      await activePdfContent(
        pdfOf(compressedObject(1, '<< /Type /Pages >>'), compressedObject(2, '<< /JSON 1 >>')),
      ),
    ).toBeNull();
  });

  it('gives the same verdict however the file is cut into chunks', async () => {
    const pieces = fc.constantFrom(
      latin1('1 0 obj\n<< /Type /Catalog /Pages 2 0 R >>\nendobj\n'),
      latin1('4 0 obj\n<< /JSON (not a script) /AAB 1 >>\nendobj\n'),
      latin1('5 0 obj\n<< /J#61vaScript 3 0 R >>\nendobj\n'),
      latin1('6 0 obj\n<< /OpenAction 7 0 R >>\nendobj\n'),
      compressedObject(8, '<< /Type /Page /Contents 9 0 R >>'),
      compressedObject(9, '<< /S /Launch /F (x) >>'),
      compressedObject(10, 'BT /F1 12 Tf (stream endstream) Tj ET'),
      latin1('11 0 obj\n<< /Length 5 >>\nstream\nhello\nendstream\nendobj\n'),
    );
    await fc.assert(
      fc.asyncProperty(
        fc.array(pieces, { maxLength: 6 }),
        fc.array(fc.nat(), { maxLength: 12 }),
        async (parts, cuts) => {
          const file = pdfOf(...parts);
          const whole = await activePdfContent(file);
          expect(await scanChunks(split(file, cuts))).toBe(whole);
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe('image trailers, cut as a stream', () => {
  const PNG = Buffer.from(
    'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
    'base64',
  );
  const JPEG = Buffer.from([
    0xff, 0xd8, 0xff, 0xe1, 0x00, 0x08, 0xff, 0xd8, 0xff, 0xd9, 0x00, 0x00, 0xff, 0xda, 0x00, 0x08, 0x01,
    0x01, 0x00, 0x00, 0x3f, 0x00, 0x12, 0xff, 0x00, 0x34, 0xff, 0xd0, 0x56, 0xff, 0xd9,
  ]);
  const keepAll = (cutter: { keep(b: Buffer): Buffer }, chunks: Buffer[]) =>
    Buffer.concat(chunks.map((c) => cutter.keep(c)));

  it('keeps a PNG up to its IEND chunk and a JPEG up to its end-of-image marker, past a thumbnail EOI in APP1', () => {
    const html = latin1('<html><script>alert(1)</script></html>');
    expect(new PngCutter().keep(Buffer.concat([PNG, html])).equals(PNG)).toBe(true);
    expect(new JpegCutter().keep(Buffer.concat([JPEG, html])).equals(JPEG)).toBe(true);
    expect(new JpegCutter().keep(JPEG).equals(JPEG)).toBe(true);
  });

  it('keeps the same bytes however the image is cut into chunks', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(PNG, JPEG),
        fc.uint8Array({ maxLength: 64 }),
        fc.array(fc.nat(), { maxLength: 10 }),
        (image, trailer, cuts) => {
          const file = Buffer.concat([image, Buffer.from(trailer)]);
          const cutter = () => (image === PNG ? new PngCutter() : new JpegCutter());
          const whole = cutter().keep(file);
          expect(whole.equals(image)).toBe(true);
          expect(keepAll(cutter(), split(file, cuts)).equals(whole)).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });
});
