// A wallet card vouches for what the welder may weld today: no card is issued when nothing is current
// (issue 10 item 8), whether no qualification was ever certified or every one is revoked.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, qualificationSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { binaryBody, couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';

describe('GET /api/welders/:id/card.pdf', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('refuses a card for a welder with nothing current, and issues one once a qualification is current (common practice (no source): a card vouches for today)', async () => {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'W-CARD', code: 'asme-ix', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const welder = world.weldersA[0]!;
    const none = await qa.get(`/api/welders/${welder.id}/card.pdf`);
    expect(none.status).toBe(409);
    expect(errorOf(none).message).toMatch(/holds no current qualification.*no wallet card is issued/);

    const coupon = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody({ welderId: welder.id, shopId: world.shopA.id, procedureId: wps.id }, { claimedResult: 'accept' }))
        .expect(201),
    );
    const q = bodyOf(
      qualificationSchema,
      await qa.post(`/api/coupons/${coupon.id}/certify`).send({ certifiedOn: daysAgo(5), version: coupon.version }).expect(201),
    );
    await qa.get(`/api/welders/${welder.id}/card.pdf`).buffer(true).parse(binaryBody).expect(200);

    await qa.post(`/api/qualifications/${q.id}/revoke`).send({ revokedOn: daysAgo(1), reason: 'Weld failed inspection on job 7' }).expect(200);
    const revoked = await qa.get(`/api/welders/${welder.id}/card.pdf`);
    expect(revoked.status).toBe(409);
  });
});

describe('the verify page names the restrictions', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('says "uphill progression only" beside the ranges of a qualification tested uphill (from memory: ASME IX QW-405.3, uphill and downhill qualify separately)', async () => {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'W-VER', code: 'asme-ix', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const welder = world.weldersA[0]!;
    const coupon = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody({ welderId: welder.id, shopId: world.shopA.id, procedureId: wps.id }, { claimedResult: 'accept' }))
        .expect(201),
    );
    await qa.post(`/api/coupons/${coupon.id}/certify`).send({ certifiedOn: daysAgo(5), version: coupon.version }).expect(201);
    const url = ((await qa.post(`/api/welders/${welder.id}/verify-token`).expect(201)).body as { url: string }).url;
    const view = (await qa.get(`/api/verify/${url.split('/verify/')[1]!}`).expect(200)).body as { qualifications: Array<{ summary: string }> };
    expect(view.qualifications[0]?.summary).toContain('uphill progression only');
  });
});
