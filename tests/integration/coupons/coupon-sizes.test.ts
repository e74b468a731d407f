// Implausible sizes on a coupon are refused by the API with the field named, through the same schema the
// form checks with (packages/rules lengthBounds), and nothing is saved.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, disc, makeProcedure } from '../../support/api-records.js';

describe('POST /api/coupons: implausible sizes (common practice (no source): typing slips, not unusual work)', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('refuses a 1e20 in wall, a 99999999 in outside diameter and a zero-size discontinuity, each at its field, saving nothing', async () => {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'S-201', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const base = couponBody(ids);
    const res = await qa.post('/api/coupons').send({
      ...base,
      pipe: null,
      coupon: {
        ...base.coupon,
        thickness: { value: 1e20, unit: 'in' },
        outsideDiameter: { value: 99999999, unit: 'in' },
      },
      examination: {
        method: 'bend',
        criteria: 'asme-ix',
        specimens: [
          { label: 'F1', kind: 'face', discontinuities: [disc('0', { value: 0, unit: 'in' })] },
          { label: 'R1', kind: 'root', discontinuities: [] },
        ],
      },
    });
    expect(res.status).toBe(400);
    const fields = errorOf(res).fields ?? {};
    expect(fields['coupon.thickness.value']).toMatch(/^The coupon thickness of 1e\+20 in is not a plausible size: enter 0.01 in to 12 in$/);
    expect(fields['coupon.outsideDiameter.value']).toMatch(/^The outside diameter of 99999999 in is not a plausible size/);
    expect(fields['examination.bend.specimens.0.discontinuities.0.size.value']).toMatch(/^A discontinuity of 0 in is not a plausible size/);
    const [n] = await api.ds.query<{ n: number }[]>('SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1', [ids.welderId]);
    expect(n!.n).toBe(0);
  });
});
