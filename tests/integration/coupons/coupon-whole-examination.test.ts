// The server judges every coupon with the rules' evaluateCoupon given the whole coupon (form, position,
// thickness, diameter, code, processes), stores that evaluation, and refuses a claimed verdict that
// disagrees. Before this, bend counts were checked without the coupon: a 6G pipe coupon passed on two
// bends.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';
import { readPdf } from '../../../apps/api/src/documents/__fixtures__/read-pdf.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const sound = (label: string, kind: 'face' | 'root' | 'side') => ({ label, kind, discontinuities: [] });
/** Four sound bends of a 6G coupon (from memory: ASME IX QW-452.1(a)). */
const fourSound = { specimens: [sound('F1', 'face'), sound('F2', 'face'), sound('R1', 'root'), sound('R2', 'root')] };
/** Four bends of a 6G coupon, the first root bend with a 3/16 in crack. */
const crackedRoot = {
  bend: {
    specimens: [
      sound('F1', 'face'),
      sound('F2', 'face'),
      {
        label: 'R1',
        kind: 'root' as const,
        discontinuities: [{ sizeText: '3/16', size: inch(3 / 16), location: 'surface' as const, type: 'crack' as const }],
      },
      sound('R2', 'root'),
    ],
  },
};

describe('POST /api/coupons: judged with the whole coupon', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup(processes = ['SMAW', 'GTAW', 'GMAW'], code = 'asme-ix') {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, {
      number: `W-${code}`,
      code: code as 'asme-ix',
      processes: processes as ['SMAW'],
    });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    return { qa, ids: { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id } };
  }

  const couponsOf = async (welderId: string) =>
    (
      await api.ds.query<{ n: number }[]>('SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1', [
        welderId,
      ])
    )[0]!.n;

  it('refuses a 6G pipe coupon with only one face and one root bend, naming the field, and saves nothing (from memory: ASME IX QW-452.1(a), 5G and 6G pipe take four bends)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: { bend: { specimens: [sound('F1', 'face'), sound('R1', 'root')] } },
        claimedResult: 'accept',
      }),
    );
    expect(res.status).toBe(400);
    const fields = errorOf(res).fields ?? {};
    expect(fields['examination.bend']).toMatch(/incomplete/i);
    expect(fields['examination.bend']).toMatch(/QW-452\.1/);
    expect(await couponsOf(ids.welderId)).toBe(0);
  });

  it('refuses the same short set sent in the first request shape ({ method: "bend" }) (from memory: ASME IX QW-452.1(a))', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: { method: 'bend', criteria: 'asme-ix', specimens: [sound('F1', 'face'), sound('R1', 'root')] },
      }),
    );
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.['examination.bend']).toMatch(/incomplete/i);
    expect(await couponsOf(ids.welderId)).toBe(0);
  });

  it('accepts the 6G coupon on two face and two root bends and stores the evaluation with its parts and clauses (from memory: ASME IX QW-452.1(a); published copies of QW-163: 1/32 in is far under 1/8 in)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(couponBody(ids, { claimedResult: 'accept' }));
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    expect(c.result).toBe('accept');
    expect(c.evaluation?.parts.map((p) => [p.kind, p.result])).toEqual([
      ['visual', 'accept'],
      ['bend', 'accept'],
    ]);
    expect(c.examination.bend?.specimens.map((s) => s.result)).toEqual(['accept', 'accept', 'accept', 'accept']);
    const [row] = await api.ds.query<{ result: string; evaluation: { result: string; parts: { kind: string }[]; codeCriteria: { id: string } } }[]>(
      'SELECT result, evaluation FROM coupons WHERE id = $1',
      [c.id],
    );
    expect(row!.result).toBe('accept');
    expect(row!.evaluation.result).toBe('accept');
    expect(row!.evaluation.parts.map((p) => p.kind)).toEqual(['visual', 'bend']);
    expect(row!.evaluation.codeCriteria.id).toBe('asme-ix');
  });

  it('refuses a claimed Accept when a root bend shows a 3/16 in crack, and saves nothing (published copies of ASME IX QW-163: an open discontinuity over 1/8 in rejects)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: crackedRoot,
        claimedResult: 'accept',
      }),
    );
    expect(res.status).toBe(400);
    const fields = errorOf(res).fields ?? {};
    expect(fields.claimedResult).toMatch(/Reject/);
    expect(fields.claimedResult).toMatch(/QW-163/);
    expect(await couponsOf(ids.welderId)).toBe(0);
  });

  it('stores a rejected coupon with the reason and clause when the claim agrees (published copies of ASME IX QW-163)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: crackedRoot,
        claimedResult: 'reject',
      }),
    );
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    expect(c.result).toBe('reject');
    expect(c.reasons.some((r) => /QW-163/.test(r.clause) && /R1/.test(r.message))).toBe(true);
    expect(c.examination.bend?.specimens[2]?.result).toBe('reject');
  });

  it('refuses radiography in place of bends for GMAW short-circuit transfer under ASME IX (from memory: ASME IX QW-304)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        coupon: {
          code: 'asme-ix',
          process: 'GMAW',
          transferMode: 'short-circuit',
          form: 'plate',
          weld: 'groove',
          position: '3G',
          thickness: inch(0.375),
          backing: true,
          fNumber: 6,
          progression: 'uphill',
        },
        pipe: null,
        examination: { volumetric: { method: 'radiography', indications: [], examinerResult: 'accept', reportNumber: 'RT-1' } },
      }),
    );
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.['examination.bend']).toMatch(/QW-304/);
    expect(await couponsOf(ids.welderId)).toBe(0);
  });

  it('judges radiography indications by type and size: a crack rejects (from memory: ASME IX QW-191.1.2.2, no crack or other planar indication)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: {
          volumetric: {
            method: 'radiography',
            indications: [{ type: 'crack', size: inch(1 / 16) }],
            reportNumber: 'RT-2',
          },
        },
        claimedResult: 'reject',
      }),
    );
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    expect(c.result).toBe('reject');
    expect(c.evaluation?.parts.map((p) => p.kind)).toEqual(['visual', 'radiography']);
    expect(c.reasons[0]?.clause).toBe('QW-191.1.2.2');
    expect(c.examination.volumetric?.indications).toEqual([{ type: 'crack', size: inch(1 / 16) }]);
  });

  it('refuses an API 1104 pipe coupon bent but not nick-broken, naming the nick-break (from memory: API 1104 welder qualification specimens)', async () => {
    const { qa, ids } = await setup(['SMAW'], 'api-1104');
    const coupon = {
      code: 'api-1104' as const,
      process: 'SMAW' as const,
      form: 'pipe' as const,
      weld: 'groove' as const,
      position: '6G',
      thickness: inch(0.322),
      backing: false,
      progression: 'downhill' as const,
    };
    const bend = { specimens: [sound('R1', 'root'), sound('R2', 'root')] };
    const without = await qa
      .post('/api/coupons')
      .send(couponBody(ids, { coupon, pipe: { nps: '8', schedule: '40' }, pNumbers: [], examination: { bend } }));
    expect(without.status).toBe(400);
    expect(errorOf(without).fields?.['examination.nickBreak']).toMatch(/nick-break/);
    expect(await couponsOf(ids.welderId)).toBe(0);

    // OD 8.625 in, wall 0.322 in: two root bends and two nick-breaks (from memory: API 1104 specimen table)
    const nickBreak = {
      specimens: [
        { id: 'N1', completePenetrationAndFusion: true },
        { id: 'N2', completePenetrationAndFusion: true },
      ],
    };
    const withNicks = await qa.post('/api/coupons').send(
      couponBody(ids, {
        coupon,
        pipe: { nps: '8', schedule: '40' },
        pNumbers: [],
        examination: { bend, nickBreak },
        claimedResult: 'accept',
      }),
    );
    expect(withNicks.status).toBe(201);
    expect(bodyOf(couponRecordSchema, withNicks).evaluation?.parts.map((p) => p.kind)).toEqual([
      'visual',
      'bend',
      'nick-break',
    ]);
  });

  it('a visual reject stops the examination there and is stored as Reject (from memory: ASME IX QW-302.4, QW-194)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        visual: { result: 'reject', findings: [{ type: 'crack' }] },
        examination: {},
        claimedResult: 'reject',
      }),
    );
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    expect(c.result).toBe('reject');
    expect(c.visual).toBe('reject');
    expect(c.visualFindings).toEqual([{ type: 'crack' }]);
    expect(c.evaluation?.parts.map((p) => p.kind)).toEqual(['visual']);
  });

  async function wpqText(qa: Awaited<ReturnType<typeof setup>>['qa'], couponId: string, version: number) {
    const q = (await qa.post(`/api/coupons/${couponId}/certify`).send({ certifiedOn: daysAgo(1), version }).expect(201))
      .body as { id: string };
    const pdf = await qa.get(`/api/qualifications/${q.id}/wpq.pdf`).buffer(true).parse(binaryBody).expect(200);
    return (await readPdf(pdf.body as Buffer)).text;
  }

  it('prints on the WPQ the fillet weld break and macro-etch actually performed, with their results and clauses (from memory: ASME IX QW-182, QW-184)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        coupon: {
          code: 'asme-ix',
          process: 'SMAW',
          form: 'plate',
          weld: 'fillet',
          position: '2F',
          thickness: inch(0.375),
          backing: true,
          fNumber: 4,
        },
        pipe: null,
        visual: { result: 'accept', findings: [{ type: 'undercut', size: inch(1 / 64) }] },
        examination: {
          filletBreak: { bentFlat: false, inclusions: [inch(1 / 16)] },
          macroEtch: { completeFusion: true, legs: [inch(3 / 8), inch(5 / 16)] },
        },
        claimedResult: 'accept',
      }),
    );
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    expect(c.evaluation?.parts.map((p) => p.kind)).toEqual(['visual', 'fillet-break', 'macro-etch']);
    const text = await wpqText(qa, c.id, c.version);
    expect(text).toMatch(/Fillet weld break Accept — judged by .*QW-181\.2, QW-182/);
    expect(text).toContain('Inclusions and pores: 1/16 in');
    expect(text).toMatch(/Macro-etch Accept — judged by .*QW-184/);
    expect(text).toContain('Fillet legs 3/8 in and 5/16 in');
    expect(text).toContain('Visual finding Undercut, 1/64 in');
    expect(text).toContain('Coupon result: Accept (every part of the examination must pass)');
    expect(text).not.toContain('Specimen result');
  });

  it('prints on the WPQ the radiography performed in place of bends, with each indication (from memory: ASME IX QW-191.1.2.2)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: {
          volumetric: {
            method: 'radiography',
            indications: [{ type: 'rounded', size: inch(1 / 32) }],
            reportNumber: 'RT-PDF-1',
          },
        },
        claimedResult: 'accept',
      }),
    );
    expect(res.status).toBe(201);
    const c = bodyOf(couponRecordSchema, res);
    const text = await wpqText(qa, c.id, c.version);
    expect(text).toMatch(/Radiography Accept — judged by .*QW-191\.1\.2\.2/);
    expect(text).toContain('Report RT-PDF-1');
    expect(text).toContain('Rounded indication (porosity), 1/32 in');
  });

  it('links a retest to the failed coupon it retests, taking its date from the record, and refuses one that names a passing coupon (from memory: ASME IX QW-321.4, a retest after further training)', async () => {
    const { qa, ids } = await setup();
    const failed = bodyOf(
      couponRecordSchema,
      await qa.post('/api/coupons').send(couponBody(ids, { testedOn: daysAgo(20), examination: crackedRoot, claimedResult: 'reject' })).expect(201),
    );
    const retest = await qa.post('/api/coupons').send(
      couponBody(ids, {
        labReportNumber: 'LR-T-RETEST',
        examination: { bend: fourSound, retest: { of: failed.id, basis: 'after-training' } },
        claimedResult: 'accept',
      }),
    );
    expect(retest.status).toBe(201);
    const r = bodyOf(couponRecordSchema, retest);
    const part = r.evaluation?.parts.find((p) => p.kind === 'retest');
    expect(part?.notes[0]?.message).toContain(`failed on ${daysAgo(20)}`);
    expect(part?.notes[0]?.clause).toBe('QW-321.4');

    const wrong = await qa.post('/api/coupons').send(
      couponBody(ids, { examination: { bend: fourSound, retest: { of: r.id, basis: 'immediate' } } }),
    );
    expect(wrong.status).toBe(400);
    expect(errorOf(wrong).fields?.['examination.retest.of']).toMatch(/rejected coupon of this welder/);
  });
});

