// The demo qualification records of Harrow Point Fabrication (all invented): a WPS register of eight
// procedures (one superseded), one to four coupons per welder across the codes of their shop with
// invented measurements — mostly passes, a few rejects followed by a retest — certified qualifications
// for the passes, a few generated sample files (a PNG sketch of a bent specimen, a one-page PDF lab report)
// and a verify token for the demo welder PV-07. Written through the same services as the API, so every
// verdict and range comes from the rules package. Idempotent: each record is found by a natural key
// (WPS number + revision, lab report number, file name) before it is added.
import PDFDocument from 'pdfkit';
import { PNG } from 'pngjs';
import {
  couponRecordInput,
  procedureInput,
  type CouponRecordInput,
  type ProcedureInput,
  type RecordedExaminationInput,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { isoDay } from '../lib/dates.js';
import { loadActor } from '../auth/auth.repository.js';
import { createProcedure } from '../procedures/procedures.service.js';
import { uploadBuffer } from '../uploads/uploads.service.js';
import { createCoupon } from '../coupons/coupons.service.js';
import { certifyCoupon } from '../qualifications/qualifications.service.js';
import { ensureVerifyUrl } from '../verify/verify-tokens.service.js';

export type RecordsSeedResult = {
  procedures: number;
  coupons: number;
  qualifications: number;
  uploads: number;
};

type Length = { value: number; unit: 'in' | 'mm' };
const inch = (value: number): Length => ({ value, unit: 'in' });

const procedures: (ProcedureInput & { key: string })[] = [
  {
    key: 'S101-3',
    number: 'HPF-S101',
    revision: '3',
    code: 'asme-ix',
    processes: ['SMAW'],
    pNumbers: ['1'],
    fNumber: 4,
    positions: ['F', 'H', 'V', 'O'],
    thicknessMin: inch(0.0625),
    thicknessMax: inch(1.5),
    notes: 'Carbon steel pipe and plate, E7018 fill and cap.',
  },
  {
    key: 'S101-2',
    number: 'HPF-S101',
    revision: '2',
    code: 'asme-ix',
    processes: ['SMAW'],
    pNumbers: ['1'],
    fNumber: 4,
    positions: ['F', 'H', 'V', 'O'],
    thicknessMin: inch(0.0625),
    thicknessMax: inch(1.25),
    status: 'superseded',
    notes: 'Replaced by rev 3 (preheat table revised).',
  },
  {
    key: 'T210-1',
    number: 'HPF-T210',
    revision: '1',
    code: 'asme-ix',
    processes: ['GTAW', 'SMAW'],
    pNumbers: ['1'],
    fNumber: 6,
    positions: ['F', 'H', 'V', 'O'],
    thicknessMin: inch(0.0625),
    thicknessMax: inch(0.75),
    notes: 'GTAW root, SMAW fill; open root.',
  },
  {
    key: 'T215-A',
    number: 'HPF-T215',
    revision: 'A',
    code: 'asme-ix',
    processes: ['GTAW'],
    pNumbers: ['8'],
    fNumber: 6,
    positions: ['F', 'H', 'V'],
    thicknessMin: inch(0.0625),
    thicknessMax: inch(0.5),
    notes: 'Austenitic stainless plate.',
  },
  {
    key: 'D330-2',
    number: 'HPF-D330',
    revision: '2',
    code: 'aws-d1.1',
    processes: ['FCAW'],
    pNumbers: [],
    positions: ['F', 'H', 'V'],
    thicknessMin: inch(0.125),
    thicknessMax: inch(1),
    notes: 'E71T-1 with CO2, steel backing.',
  },
  {
    key: 'D340-1',
    number: 'HPF-D340',
    revision: '1',
    code: 'aws-d1.1',
    processes: ['SMAW'],
    pNumbers: [],
    fNumber: 4,
    positions: ['F', 'H', 'V', 'O'],
    thicknessMin: inch(0.125),
    notes: 'Structural plate, E7018.',
  },
  {
    key: 'P410-4',
    number: 'HPF-P410',
    revision: '4',
    code: 'api-1104',
    processes: ['SMAW'],
    pNumbers: [],
    positions: ['F', 'V', 'O'],
    notes: 'Cellulosic downhill, line pipe.',
  },
  {
    key: 'P420-1',
    number: 'HPF-P420',
    revision: '1',
    code: 'api-1104',
    processes: ['SMAW'],
    pNumbers: [],
    positions: ['F', 'V', 'O'],
    notes: 'Low-hydrogen uphill fill and cap for tie-ins.',
  },
];

type Plan = {
  wps: string;
  shop: string;
  coupon: CouponRecordInput['coupon'];
  pipe?: { nps: string; schedule: string };
  criteria: 'asme-ix' | 'aws-d1.1' | 'api-1104';
  kinds: ('face' | 'root' | 'side')[];
};

const plans: Record<string, Plan[]> = {
  PV: [
    {
      wps: 'S101-3',
      shop: 'PV',
      coupon: {
        code: 'asme-ix',
        process: 'SMAW',
        form: 'pipe',
        weld: 'groove',
        position: '6G',
        thickness: inch(0.218),
        layers: 3,
        backing: false,
        fNumber: 4,
        progression: 'uphill',
      },
      pipe: { nps: '2', schedule: '80' },
      criteria: 'asme-ix',
      kinds: ['face', 'face', 'root', 'root'],
    },
    {
      wps: 'T210-1',
      shop: 'PV',
      coupon: {
        code: 'asme-ix',
        process: 'GTAW',
        form: 'plate',
        weld: 'groove',
        position: '3G',
        thickness: inch(0.375),
        depositedThickness: inch(0.125),
        layers: 2,
        backing: false,
        fNumber: 6,
        progression: 'uphill',
      },
      criteria: 'asme-ix',
      kinds: ['face', 'root'],
    },
    {
      wps: 'S101-3',
      shop: 'PV',
      coupon: {
        code: 'asme-ix',
        process: 'SMAW',
        form: 'plate',
        weld: 'groove',
        position: '2G',
        thickness: inch(0.375),
        layers: 4,
        backing: true,
        fNumber: 4,
      },
      criteria: 'asme-ix',
      kinds: ['side', 'side'],
    },
    {
      wps: 'T215-A',
      shop: 'PV',
      coupon: {
        code: 'asme-ix',
        process: 'GTAW',
        form: 'plate',
        weld: 'groove',
        position: '1G',
        thickness: inch(0.25),
        layers: 3,
        backing: true,
        fNumber: 6,
      },
      criteria: 'asme-ix',
      kinds: ['face', 'root'],
    },
  ],
  ST: [
    {
      wps: 'D330-2',
      shop: 'ST',
      coupon: {
        code: 'aws-d1.1',
        process: 'FCAW',
        form: 'plate',
        weld: 'groove',
        position: '3G',
        thickness: inch(0.375),
        backing: true,
        progression: 'uphill',
      },
      criteria: 'aws-d1.1',
      kinds: ['face', 'root'],
    },
    {
      wps: 'D340-1',
      shop: 'ST',
      coupon: {
        code: 'aws-d1.1',
        process: 'SMAW',
        form: 'plate',
        weld: 'groove',
        position: '4G',
        thickness: inch(1),
        backing: true,
        fNumber: 4,
      },
      criteria: 'aws-d1.1',
      kinds: ['side', 'side'],
    },
    {
      wps: 'D330-2',
      shop: 'ST',
      coupon: {
        code: 'aws-d1.1',
        process: 'FCAW',
        form: 'plate',
        weld: 'groove',
        position: '2G',
        thickness: inch(0.375),
        backing: true,
      },
      criteria: 'aws-d1.1',
      kinds: ['face', 'root'],
    },
  ],
  PL: [
    {
      wps: 'P410-4',
      shop: 'PL',
      coupon: {
        code: 'api-1104',
        process: 'SMAW',
        form: 'pipe',
        weld: 'groove',
        position: '6G',
        thickness: inch(0.322),
        backing: false,
        progression: 'downhill',
      },
      pipe: { nps: '8', schedule: '40' },
      criteria: 'api-1104',
      kinds: ['root', 'root'],
    },
    {
      wps: 'P410-4',
      shop: 'PL',
      coupon: {
        code: 'api-1104',
        process: 'SMAW',
        form: 'pipe',
        weld: 'groove',
        position: '5G',
        thickness: inch(0.28),
        backing: false,
        progression: 'downhill',
      },
      pipe: { nps: '6', schedule: '40' },
      criteria: 'api-1104',
      kinds: ['root', 'root'],
    },
  ],
};

// Small invented indications a passing specimen shows; the size text is what an examiner would type.
const passing = [
  { sizeText: '1/32', size: inch(1 / 32), type: 'porosity' as const },
  { sizeText: '1/16', size: inch(1 / 16), type: 'slag' as const, fusionRelated: true },
  // One test is recorded in one unit system (the rules refuse a mix): these specimens are in inches.
  { sizeText: '0.03 in', size: inch(0.03), type: 'porosity' as const },
  { sizeText: '3/64 in', size: inch(3 / 64), type: 'undercut' as const },
];
// The rejects: an open discontinuity over the 1/8 in (3 mm) limit.
const rejecting = [
  { sizeText: '3/16', size: inch(3 / 16), type: 'crack' as const },
  { sizeText: '5/32 in', size: inch(5 / 32), type: 'lack-of-fusion' as const, fusionRelated: true },
];

function bentSpecimenPng(): Buffer {
  const width = 240;
  const height = 140;
  const png = new PNG({ width, height });
  const cx = width / 2;
  const cy = 20;
  for (let y = 0; y < height; y++)
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 4;
      // A U-shaped bent strap: the band between two concentric half-rings and their straight legs.
      const dx = x - cx;
      const dy = y - (height - 40);
      const r = Math.hypot(dx, dy);
      const bend = dy >= 0 && r >= 40 && r <= 60;
      const legs = dy < 0 && y > cy && Math.abs(Math.abs(dx) - 50) <= 10;
      const mark = bend && Math.abs(dx) < 3 && dy > 50; // the indication on the convex face
      const [red, green, blue] = mark ? [176, 32, 32] : bend || legs ? [96, 104, 112] : [250, 250, 248];
      png.data[i] = red;
      png.data[i + 1] = green;
      png.data[i + 2] = blue;
      png.data[i + 3] = 255;
    }
  return PNG.sync.write(png);
}

function labReportPdf(lines: string[]): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'LETTER', margin: 56, info: { Title: lines[0] ?? 'Lab report' } });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.fontSize(16).text(lines[0] ?? '');
    doc.moveDown();
    doc.fontSize(10);
    for (const line of lines.slice(1)) doc.text(line);
    doc.end();
  });
}

const addDays = (day: string, n: number) => isoDay(new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000));

export async function seedRecords(
  deps: AppDeps,
  organizationId: string,
  qaUserId: string,
): Promise<RecordsSeedResult> {
  const r: RecordsSeedResult = { procedures: 0, coupons: 0, qualifications: 0, uploads: 0 };
  const db = deps.dataSource.manager;
  const actor: Actor | null = await loadActor(db, qaUserId);
  if (!actor) throw new Error('The demo QA manager cannot sign in; seed the foundation first');
  const today = isoDay(deps.clock.now());

  const wpsIds: Record<string, string> = {};
  for (const { key, ...p } of procedures) {
    const [found] = await db.query<{ id: string }[]>(
      `SELECT id FROM procedures WHERE organization_id = $1 AND number = $2 AND revision = $3`,
      [organizationId, p.number, p.revision],
    );
    wpsIds[key] = found?.id ?? (await createProcedure(deps, actor, procedureInput.parse(p))).id;
    if (!found) r.procedures++;
  }

  async function ensureUpload(
    fileName: string,
    kind: 'specimen-photo' | 'examination-report',
    make: () => Promise<Buffer> | Buffer,
  ) {
    const [found] = await db.query<{ id: string }[]>(
      `SELECT id FROM uploads WHERE organization_id = $1 AND file_name = $2 ORDER BY created_at LIMIT 1`,
      [organizationId, fileName],
    );
    if (found) return found.id;
    r.uploads++;
    return (await uploadBuffer(deps, actor!, { buffer: await make(), originalname: fileName }, kind)).id;
  }
  const photo = await ensureUpload('PV-07 root bend R1.png', 'specimen-photo', bentSpecimenPng);
  const photo2 = await ensureUpload('ST-04 face bend F1.png', 'specimen-photo', bentSpecimenPng);
  const report = await ensureUpload('Lab report HPL-PV-07-1.pdf', 'examination-report', () =>
    labReportPdf([
      'Harrow Point test lab — bend test report HPL-PV-07-1',
      'Welder PV-07, WPS HPF-S101 rev 3, NPS 2 Sch 80 pipe, 6G.',
      'Four specimens (two face, two root) bent over the standard mandrel.',
      'Largest indication 1/16 in (slag, face F2). Examined by the shop examiner; sample document for the demo.',
    ]),
  );

  const shops: { code: string; id: string }[] = await db.query(
    `SELECT code, id FROM shops WHERE organization_id = $1`,
    [organizationId],
  );
  const shopId = Object.fromEntries(shops.map((s) => [s.code, s.id]));
  const welders: { id: string; stamp: string }[] = await db.query(
    `SELECT id, stamp FROM welders WHERE organization_id = $1 ORDER BY stamp`,
    [organizationId],
  );
  const existing = new Set(
    (
      await db.query<{ lab: string }[]>(
        `SELECT lab_report_number AS lab FROM coupons WHERE organization_id = $1`,
        [organizationId],
      )
    ).map((x) => x.lab),
  );

  for (const [index, w] of welders.entries()) {
    const shopCode = w.stamp.slice(0, 2);
    const options = plans[shopCode];
    if (!options) continue;
    // One to three tests each (a reject brings its retest, so at most four coupons).
    const n = w.stamp === 'PV-07' ? 3 : 1 + ((index * 7) % 3);
    // Tests spread over the last two years, so that the continuity seed can log up to two years of use
    // after them: most current, some lapsing soon, a few lapsed.
    const base = w.stamp === 'PV-07' ? 40 : 60 + ((index * 37) % 660);
    for (let k = 0; k < n; k++) {
      const plan = options[(index + k) % options.length]!;
      const lab = `HPL-${w.stamp}-${k + 1}`;
      if (existing.has(lab)) continue;
      const rejects = w.stamp !== 'PV-07' && (index + k) % 9 === 4;
      const testedOn = addDays(today, -(base + k * 11));
      const specimens = plan.kinds.map((kind, s) => ({
        label: `${kind[0]!.toUpperCase()}${s + 1}`,
        kind,
        discontinuities:
          rejects && kind !== 'face'
            ? [{ ...rejecting[(index + s) % rejecting.length]!, location: 'surface' as const }]
            : (index + s + k) % 3 === 0
              ? [{ ...passing[(index + s) % passing.length]!, location: 'surface' as const }]
              : [],
        photoUploadId:
          w.stamp === 'PV-07' && k === 0 && s === plan.kinds.indexOf('root')
            ? photo
            : w.stamp === 'ST-04' && k === 0 && s === 0
              ? photo2
              : null,
      }));
      // PV-07's second test was examined by radiography instead of bends, with the lab's report attached.
      // API 1104 welder tests are nick-broken as well as bent (from memory: API 1104 welder qualification
      // specimens): two for these OD 4-1/2 in to 12-3/4 in coupons, sound fractures.
      const nickBreak =
        plan.coupon.code === 'api-1104'
          ? {
              nickBreak: {
                specimens: ['N1', 'N2'].map((id) => ({ id, completePenetrationAndFusion: true, gasPockets: [] })),
              },
            }
          : {};
      const examination: RecordedExaminationInput =
        w.stamp === 'PV-07' && k === 1
          ? {
              volumetric: {
                method: 'radiography',
                indications: [],
                examinerResult: 'accept',
                reportNumber: `RT-${lab}`,
                reportUploadId: report,
              },
            }
          : { criteria: plan.criteria, bend: { specimens }, ...nickBreak };
      const record = async (on: string, labNumber: string, exam: typeof examination, notes: string) => {
        const coupon = await createCoupon(
          deps,
          actor,
          couponRecordInput.parse({
            welderId: w.id,
            shopId: shopId[plan.shop],
            procedureId: wpsIds[plan.wps],
            testedOn: on,
            coupon: plan.coupon,
            pipe: plan.pipe ?? null,
            pNumbers: plan.coupon.code === 'asme-ix' ? ['1', '1'] : [],
            examiner: { name: 'Petra Lindqvist-Oyelowo', certificateNumber: 'HPF-EX-0412' },
            labReportNumber: labNumber,
            visual: 'accept',
            examination: exam,
            notes,
          }),
        );
        r.coupons++;
        if (coupon.result === 'accept') {
          await certifyCoupon(deps, actor, coupon.id, {
            certifiedOn: addDays(on, 2),
            version: coupon.version,
          });
          r.qualifications++;
        }
      };
      await record(testedOn, lab, examination, rejects ? 'Root bend opened up; retest booked.' : '');
      // A reject is followed by a retest of the same joint nine days later, which passes.
      if (rejects && !existing.has(`${lab}-R`))
        await record(
          addDays(testedOn, 9),
          `${lab}-R`,
          {
            criteria: plan.criteria,
            bend: { specimens: specimens.map((s) => ({ ...s, discontinuities: [] })) },
            ...nickBreak,
          },
          'Retest after the rejected coupon.',
        );
    }
  }

  const [pv07] = await db.query<{ id: string }[]>(
    `SELECT id FROM welders WHERE organization_id = $1 AND stamp = 'PV-07'`,
    [organizationId],
  );
  if (pv07) await ensureVerifyUrl(deps, actor, pv07.id);
  return r;
}
