// Issue 9 error 9: a coupon is judged by its code's acceptance criteria; an in-house set only in
// addition (stricter), never instead; the stored evaluation names the code's criteria it met; a coupon
// judged by in-house criteria alone cannot be certified.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, disc, makeProcedure } from '../../support/api-records.js';

describe('coupons: judged by the code’s criteria', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup() {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'C-9', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const count = async () =>
      Number(
        (
          await api.ds.query<[{ n: string }]>(`SELECT count(*) AS n FROM coupons WHERE welder_id = $1`, [
            ids.welderId,
          ])
        )[0].n,
      );
    return { qa, ids, count };
  }

  // three 3/32 in indications on one specimen: 9/32 in in all
  const threeSmall = [
    disc('3/32', { value: 3 / 32, unit: 'in' }),
    disc('3/32', { value: 3 / 32, unit: 'in' }),
    disc('3/32', { value: 3 / 32, unit: 'in' }),
  ];

  it('refuses an ASME IX coupon judged by shop criteria instead of QW-163, naming the field, and saves nothing', async () => {
    const { qa, ids, count } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: {
          method: 'bend',
          criteria: 'shop-general',
          specimens: [
            { kind: 'face', discontinuities: [] },
            { kind: 'root', discontinuities: [] },
          ],
        },
      }),
    );
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.['examination.criteria']).toMatch(
      /^A ASME IX coupon is judged by the code's own acceptance criteria \(ASME IX QW-163\)/,
    );
    expect(await count()).toBe(0);
  });

  it('common practice (no source); published: ASME IX QW-163 (read second-hand) — shop criteria in addition reject 9/32 in in all that QW-163 alone accepts, and the stored evaluation names both', async () => {
    const { qa, ids } = await setup();
    // a 6G pipe coupon: two face and two root bends (from memory: ASME IX QW-452.1(a))
    const exam = (additional?: 'shop-general') => ({
      criteria: 'asme-ix' as const,
      ...(additional ? { additionalCriteria: additional } : {}),
      bend: {
        specimens: [
          { label: 'F1', kind: 'face' as const, discontinuities: threeSmall },
          { label: 'F2', kind: 'face' as const, discontinuities: [] },
          { label: 'R1', kind: 'root' as const, discontinuities: [] },
          { label: 'R2', kind: 'root' as const, discontinuities: [] },
        ],
      },
    });
    const codeOnly = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { examination: exam() }))
        .expect(201),
    );
    expect(codeOnly.result).toBe('accept');
    expect(codeOnly.evaluation?.codeCriteria).toMatchObject({ id: 'asme-ix', clause: 'ASME IX QW-163' });
    expect(codeOnly.evaluation?.additionalCriteria).toBeNull();

    const res = await qa
      .post('/api/coupons')
      .send(couponBody(ids, { examination: exam('shop-general'), claimedResult: 'reject' }))
      .expect(201);
    const both = bodyOf(couponRecordSchema, res);
    expect(both.result).toBe('reject');
    expect(both.criteriaId).toBe('asme-ix');
    expect(both.additionalCriteriaId).toBe('shop-general');
    expect(both.evaluation?.parts.map((p) => p.kind)).toEqual(['visual', 'bend']);
    expect(both.evaluation?.parts[1]?.criteria.map((c) => c.id)).toEqual(['asme-ix', 'shop-general']);
    expect(both.reasons[0]?.message).toMatch(
      /^F1 \(face\): The 3 counted discontinuities add up to more than allowed/,
    );
    const [row] = await api.ds.query<
      [{ evaluation: { rulesVersion: string }; additional_criteria_id: string }]
    >(`SELECT evaluation, additional_criteria_id FROM coupons WHERE id = $1`, [both.id]);
    expect(row.additional_criteria_id).toBe('shop-general');
    expect(row.evaluation.rulesVersion).toBe(both.rulesVersion);
  });

  it('refuses a claimed accept on a face bend alone (the set is incomplete), naming the field', async () => {
    const { qa, ids, count } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        claimedResult: 'accept',
        examination: {
          method: 'bend',
          criteria: 'asme-ix',
          specimens: [{ kind: 'face', discontinuities: [] }],
        },
      }),
    );
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.['examination.bend']).toMatch(/specimen set is incomplete/);
    expect(await count()).toBe(0);
  });

  it('will not certify a coupon stored as judged by in-house criteria alone (recorded before the rule)', async () => {
    const { qa, ids } = await setup();
    const c = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(couponBody(ids)).expect(201));
    // a coupon from before rules 2.0.0, judged by the shop's set only
    await api.ds.query(`UPDATE coupons SET criteria_id = 'shop-general', evaluation = NULL WHERE id = $1`, [
      c.id,
    ]);
    const res = await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: c.version });
    expect(res.status).toBe(409);
    expect(errorOf(res).message).toMatch(/judged by in-house criteria instead of its code's/);
    const listed = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${c.id}`).expect(200));
    expect(listed.evaluation).toBeNull();
  });
});
