// A coupon is judged on the whole examination its code calls for: an incomplete bend set is refused with
// its clause, never saved as passing; radiography in place of bends is judged on its own.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, makeProcedure } from '../../support/api-records.js';

describe('POST /api/coupons: the whole examination', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup() {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'S-301', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    return { qa, ids: { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id } };
  }

  it('refuses a 6G coupon with one face bend alone, saying its root bend is missing, and saves nothing (from memory: QW-452.1(a), a face bend needs its root bend)', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: { method: 'bend', criteria: 'asme-ix', specimens: [{ label: 'F1', kind: 'face', discontinuities: [] }] },
      }),
    );
    expect(res.status).toBe(400);
    const fields = errorOf(res).fields ?? {};
    expect(fields['examination.bend']).toMatch(/incomplete/);
    expect(fields['examination.bend']).toMatch(/root/);
    const [n] = await api.ds.query<{ n: number }[]>('SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1', [ids.welderId]);
    expect(n!.n).toBe(0);
  });

  it('accepts radiography in place of bends', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, { examination: { method: 'radiography', result: 'accept', reportNumber: 'RT-77' }, claimedResult: 'accept' }),
    );
    expect(res.status).toBe(201);
    expect(bodyOf(couponRecordSchema, res).result).toBe('accept');
  });
});
