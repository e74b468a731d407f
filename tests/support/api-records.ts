// Records for the qualification tests: WPS rows, coupon bodies as the coupon form sends them, and small
// real files (a PNG drawn with pngjs, a one-page PDF from pdfkit) to upload.
import PDFDocument from 'pdfkit';
import { PNG } from 'pngjs';
import type { Response } from 'superagent';
import type { DataSource } from 'typeorm';
import type { CouponRecordInput, ProcedureInput } from '@beadroll/rules';
import type { Company } from './factories.js';

export async function makeProcedure(
  ds: DataSource,
  org: Company,
  p: Partial<ProcedureInput> & { number: string },
): Promise<{ id: string; number: string; revision: string }> {
  const [row] = await ds.query<{ id: string; number: string; revision: string }[]>(
    `INSERT INTO procedures (organization_id, number, revision, code, processes, p_numbers, f_number, positions, status)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9) RETURNING id, number, revision`,
    [
      org.id,
      p.number,
      p.revision ?? 'A',
      p.code ?? 'asme-ix',
      p.processes ?? ['SMAW'],
      p.pNumbers ?? ['1'],
      p.fNumber ?? 4,
      p.positions ?? [],
      p.status ?? 'active',
    ],
  );
  return row!;
}

/** An ISO date n days before today (UTC), so continuity states do not depend on when the tests run. */
export const daysAgo = (n: number): string =>
  new Date(Date.now() - n * 86_400_000).toISOString().slice(0, 10);

export const disc = (
  sizeText: string,
  size: { value: number; unit: 'in' | 'mm' },
  more: {
    type?: 'crack' | 'slag' | 'porosity';
    fusionRelated?: boolean;
    location?: 'surface' | 'corner';
  } = {},
) => ({ sizeText, size, location: 'surface' as const, ...more });

/** ASME IX, SMAW, 6G pipe NPS 2 Sch 80 (wall 0.218 in), no backing, F-No. 4: face + root bends. */
export function couponBody(
  ids: { welderId: string; shopId: string; procedureId: string },
  over: Partial<CouponRecordInput> = {},
): CouponRecordInput {
  return {
    ...ids,
    testedOn: daysAgo(10),
    coupon: {
      code: 'asme-ix',
      process: 'SMAW',
      form: 'pipe',
      weld: 'groove',
      position: '6G',
      thickness: { value: 0.218, unit: 'in' },
      layers: 3,
      backing: false,
      fNumber: 4,
      progression: 'uphill',
    },
    pipe: { nps: '2', schedule: '80' },
    pNumbers: ['1', '1'],
    examiner: { name: 'Ivo Testbench', certificateNumber: 'EX-0001' },
    labReportNumber: 'LR-T-001',
    visual: 'accept',
    // A 6G pipe coupon takes four bends, two face and two root (from memory: ASME IX QW-452.1(a)).
    examination: {
      bend: {
        specimens: [
          { label: 'F1', kind: 'face', discontinuities: [disc('1/32', { value: 1 / 32, unit: 'in' })] },
          { label: 'F2', kind: 'face', discontinuities: [] },
          { label: 'R1', kind: 'root', discontinuities: [] },
          { label: 'R2', kind: 'root', discontinuities: [] },
        ],
      },
    },
    notes: '',
    ...over,
  };
}

/** A small real PNG: a grey bar on white, like a bent-specimen sketch. */
export function samplePng(width = 64, height = 24): Buffer {
  const png = new PNG({ width, height });
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 4;
      const bar = y > height / 3 && y < (2 * height) / 3;
      png.data[i] = png.data[i + 1] = png.data[i + 2] = bar ? 90 : 255;
      png.data[i + 3] = 255;
    }
  return PNG.sync.write(png);
}

/** A one-page real PDF with a line of text. */
export function samplePdf(text = 'Lab report LR-T-001: bend specimens examined'): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4' });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.text(text);
    doc.end();
  });
}

/** A supertest parser that keeps a binary body as one Buffer (for PDFs and images). */
export function binaryBody(res: Response, done: (err: Error | null, body: Buffer) => void): void {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
  stream.on('error', (err: Error) => done(err, Buffer.alloc(0)));
}
