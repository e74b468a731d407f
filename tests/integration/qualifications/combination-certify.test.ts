// A combination coupon (QW-306: a GTAW root and an SMAW fill in one coupon) qualifies each process with the
// weld metal it deposited: certifying it issues one qualification per process, each with its own
// thickness range, and the coupon is continuity evidence for both processes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, qualificationSchema, type QualifiedRanges } from '@beadroll/rules';
import { z } from 'zod';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const side = (label: string) => ({ label, kind: 'side' as const, discontinuities: [] });

describe('certifying a combination coupon', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup(processes: Array<'GTAW' | 'SMAW'> = ['GTAW', 'SMAW']) {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: `W-COMBO-${processes.join('')}`, code: 'asme-ix', processes });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    return { qa, ids: { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id } };
  }

  /** A 3/4 in ASME IX plate in 1G: GTAW root 1/8 in, SMAW fill 5/8 in in five layers; two side bends. */
  const combination = (ids: Parameters<typeof couponBody>[0]) =>
    couponBody(ids, {
      testedOn: daysAgo(10),
      coupon: {
        code: 'asme-ix',
        process: 'GTAW',
        form: 'plate',
        weld: 'groove',
        position: '1G',
        thickness: inch(0.75),
        backing: false,
        fNumber: 6,
      },
      pipe: null,
      examination: {
        bend: { specimens: [side('S1'), side('S2')] },
        layers: [
          { process: 'GTAW', depositedThickness: inch(0.125), fNumber: 6 },
          { process: 'SMAW', depositedThickness: inch(0.625), fNumber: 4, layers: 5 },
        ],
      },
      claimedResult: 'accept',
    });

  it('issues one qualification per process, each with its own thickness range, both current and audited (from memory: ASME IX QW-306; QW-452.1(b): up to 2t, t of 1/2 in or more in three layers or more: no limit)', async () => {
    const { qa, ids } = await setup();
    const coupon = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(combination(ids)).expect(201));
    const [stored] = await api.ds.query<{ processes: string[] }[]>('SELECT processes FROM coupons WHERE id = $1', [coupon.id]);
    expect(stored?.processes).toEqual(['GTAW', 'SMAW']);

    const first = bodyOf(
      qualificationSchema,
      await qa.post(`/api/coupons/${coupon.id}/certify`).send({ certifiedOn: daysAgo(5), version: coupon.version }).expect(201),
    );
    expect(first.process).toBe('GTAW');

    const list = bodyOf(z.object({ items: z.array(qualificationSchema) }), await qa.get(`/api/qualifications?welderId=${ids.welderId}`).expect(200));
    const byProcess = new Map(list.items.map((q) => [q.process, q]));
    expect([...byProcess.keys()].sort()).toEqual(['GTAW', 'SMAW']);
    const gtaw = byProcess.get('GTAW')!;
    const smaw = byProcess.get('SMAW')!;
    expect(gtaw.couponId).toBe(coupon.id);
    expect(smaw.couponId).toBe(coupon.id);
    expect(gtaw.number).not.toBe(smaw.number);
    // GTAW deposited 1/8 in: up to 2t = 1/4 in; SMAW 5/8 in in five layers: no upper limit
    expect((gtaw.ranges as unknown as QualifiedRanges).thickness.max).toEqual(inch(0.25));
    expect((smaw.ranges as unknown as QualifiedRanges).thickness.max).toBeNull();
    expect((smaw.ranges as unknown as QualifiedRanges).fNumbers).toContain(4);
    expect(gtaw.status.state).toBe('current');
    expect(smaw.status.state).toBe('current');

    // the coupon is the test of both pairs: each pair's last evidence is the test day
    const states = await api.ds.query<{ process: string; last: string }[]>(
      `SELECT process, to_char(last_evidence, 'YYYY-MM-DD') AS last FROM continuity_states WHERE welder_id = $1 ORDER BY process`,
      [ids.welderId],
    );
    expect(states).toEqual([
      { process: 'GTAW', last: daysAgo(10) },
      { process: 'SMAW', last: daysAgo(10) },
    ]);
    const audits = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM audit_events WHERE action = 'qualification.certified' AND entity_id = ANY($1::uuid[])`,
      [[gtaw.id, smaw.id]],
    );
    expect(audits[0]?.n).toBe(2);

    const again = await qa.post(`/api/coupons/${coupon.id}/certify`).send({ certifiedOn: daysAgo(5), version: coupon.version });
    expect(again.status).toBe(409);
    const page = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${coupon.id}`).expect(200));
    expect(page.qualificationId).toBe(gtaw.id);
  });

  it('refuses a combination coupon whose WPS does not cover every process in it, naming the WPS field (from memory: ASME IX QW-306)', async () => {
    const { qa, ids } = await setup(['GTAW']);
    const res = await qa.post('/api/coupons').send(combination(ids));
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.procedureId).toMatch(/does not cover SMAW/);
  });
});
