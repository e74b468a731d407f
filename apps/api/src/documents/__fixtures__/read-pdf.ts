// Reads a rendered PDF back the way a person or a program would: its text through pdf-parse (pdf.js),
// its fonts and page sizes from the file's own objects, its images and rendered pages as PNGs.
import jsQRModule from 'jsqr';
import { PDFParse } from 'pdf-parse';
import { PNG } from 'pngjs';

export type ReadPdf = {
  /** Text of all pages, whitespace collapsed to single spaces (cells wrap onto several lines). */
  text: string;
  pages: string[];
  /** Every /BaseFont named in the file. */
  fonts: string[];
  /** [width, height] of each page in points. */
  mediaBoxes: Array<[number, number]>;
};

// jsqr is a CommonJS build whose types declare an ES default export: under NodeNext the default import is
// the CommonJS module, whose `default` is the decoder (at run time too).
const jsQR = jsQRModule.default;

const squash = (s: string): string => s.replace(/\s+/g, ' ').trim();

export async function readPdf(pdf: Buffer): Promise<ReadPdf> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const result = await parser.getText();
    const raw = pdf.toString('latin1');
    return {
      text: squash(result.pages.map((p) => p.text).join(' ')),
      pages: result.pages.map((p) => squash(p.text)),
      fonts: [...raw.matchAll(/\/BaseFont\s*\/([^\s/<>[\]]+)/g)].map((m) => m[1] ?? ''),
      mediaBoxes: [...raw.matchAll(/\/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]/g)].map((m) => [
        Number(m[1]),
        Number(m[2]),
      ]),
    };
  } finally {
    await parser.destroy();
  }
}

/** Decodes a QR code in a PNG; null when no code is found. */
export function decodeQr(png: Buffer | Uint8Array): string | null {
  const image = PNG.sync.read(Buffer.from(png));
  return (
    jsQR(
      new Uint8ClampedArray(image.data.buffer, image.data.byteOffset, image.data.length),
      image.width,
      image.height,
    )?.data ?? null
  );
}

/** The images embedded on each page, as PNGs. */
export async function pdfImages(
  pdf: Buffer,
): Promise<Array<{ page: number; png: Uint8Array; width: number; height: number }>> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const result = await parser.getImage({ imageThreshold: 0, imageDataUrl: false });
    return result.pages.flatMap((p) =>
      p.images.map((i) => ({ page: p.pageNumber, png: i.data, width: i.width, height: i.height })),
    );
  } finally {
    await parser.destroy();
  }
}

/** One page rendered to a PNG, as a screen or a phone camera would see it. */
export async function pageScreenshot(pdf: Buffer, page: number, scale: number): Promise<Uint8Array> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    const result = await parser.getScreenshot({ partial: [page], scale, imageDataUrl: false });
    const shot = result.pages[0];
    if (!shot) throw new Error(`Page ${page} did not render`);
    return shot.data;
  } finally {
    await parser.destroy();
  }
}
