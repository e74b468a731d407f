// Retests linked to the failed coupon and judged as a whole (issue 9): an immediate retest under ASME IX is
// two consecutive coupons in the position failed, all passing; the first of the pair is saved as a passing
// coupon that waits for the second, and certification waits for the whole retest. API 1104 allows one
// second opportunity; further retests only after training.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, qualificationSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, makeProcedure } from '../../support/api-records.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const sound = (label: string, kind: 'face' | 'root' | 'side') => ({ label, kind, discontinuities: [] });
const cracked = (label: string, kind: 'face' | 'root') => ({
  label,
  kind,
  discontinuities: [{ sizeText: '3/16', size: inch(3 / 16), location: 'surface' as const, type: 'crack' as const }],
});
/** A 6G coupon takes four bends (from memory: ASME IX QW-452.1(a)). */
const fourSound = { specimens: [sound('F1', 'face'), sound('F2', 'face'), sound('R1', 'root'), sound('R2', 'root')] };
const crackedRoot = { specimens: [sound('F1', 'face'), sound('F2', 'face'), cracked('R1', 'root'), sound('R2', 'root')] };

describe('retests of a failed coupon', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup() {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'W-RT', code: 'asme-ix', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const failed = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { testedOn: daysAgo(20), examination: { bend: crackedRoot }, claimedResult: 'reject' }))
        .expect(201),
    );
    return { qa, ids, failed };
  }

  it('saves the first coupon of an immediate retest as passing and waiting for the second, refuses to certify it alone, and certifies once both pass (from memory: ASME IX QW-321.2, two consecutive coupons, all passing)', async () => {
    const { qa, ids, failed } = await setup();
    const first = await qa.post('/api/coupons').send(
      couponBody(ids, {
        testedOn: daysAgo(12),
        examination: { bend: fourSound, retest: { of: failed.id, basis: 'immediate' } },
        claimedResult: 'accept',
      }),
    );
    expect(first.status).toBe(201);
    const one = bodyOf(couponRecordSchema, first);
    expect(one.result).toBe('accept');
    expect(one.retestOfId).toBe(failed.id);
    expect(one.retestSet?.verdict).toMatchObject({ result: 'awaiting', needed: 2, recorded: 1, clause: 'QW-321.2' });
    const [row] = await api.ds.query<{ retest_of_id: string }[]>('SELECT retest_of_id FROM coupons WHERE id = $1', [one.id]);
    expect(row?.retest_of_id).toBe(failed.id);

    const alone = await qa.post(`/api/coupons/${one.id}/certify`).send({ certifiedOn: daysAgo(1), version: one.version });
    expect(alone.status).toBe(409);
    expect(errorOf(alone).message).toMatch(/retest that has not passed as a whole/);
    expect(errorOf(alone).message).toMatch(/QW-321\.2/);

    const second = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(
          couponBody(ids, {
            testedOn: daysAgo(11),
            labReportNumber: 'LR-T-002',
            examination: { bend: fourSound, retest: { of: failed.id, basis: 'immediate' } },
            claimedResult: 'accept',
          }),
        )
        .expect(201),
    );
    expect(second.retestSet?.verdict).toMatchObject({ result: 'accept', recorded: 2 });
    expect(second.retestSet?.coupons.map((c) => c.id)).toEqual([one.id, second.id]);

    // the failed coupon lists its retests; the first coupon now reads the whole retest as passed
    const failedNow = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${failed.id}`).expect(200));
    expect(failedNow.retests.map((r) => [r.id, r.basis, r.result])).toEqual([
      [one.id, 'immediate', 'accept'],
      [second.id, 'immediate', 'accept'],
    ]);
    const firstNow = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${one.id}`).expect(200));
    expect(firstNow.retestSet?.verdict.result).toBe('accept');

    const certified = bodyOf(
      qualificationSchema,
      await qa.post(`/api/coupons/${one.id}/certify`).send({ certifiedOn: daysAgo(1), version: firstNow.version }).expect(201),
    );
    expect(certified.couponId).toBe(one.id);
    // one retest, one qualification
    const twin = await qa.post(`/api/coupons/${second.id}/certify`).send({ certifiedOn: daysAgo(1), version: second.version });
    expect(twin.status).toBe(409);
    expect(errorOf(twin).message).toMatch(/already certified/);
  });

  it('fails the immediate retest as a whole when the second coupon fails, so the passing first coupon is never certified (from memory: ASME IX QW-321.2, QW-321.4)', async () => {
    const { qa, ids, failed } = await setup();
    const one = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { testedOn: daysAgo(12), examination: { bend: fourSound, retest: { of: failed.id, basis: 'immediate' } }, claimedResult: 'accept' }))
        .expect(201),
    );
    const two = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { testedOn: daysAgo(11), examination: { bend: crackedRoot, retest: { of: failed.id, basis: 'immediate' } }, claimedResult: 'reject' }))
        .expect(201),
    );
    expect(two.retestSet?.verdict.result).toBe('reject');
    const firstNow = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${one.id}`).expect(200));
    expect(firstNow.result).toBe('accept');
    expect(firstNow.retestSet?.verdict.result).toBe('reject');
    expect(firstNow.retestSet?.verdict.message).toMatch(/further training \(QW-321\.4\)/);
    const res = await qa.post(`/api/coupons/${one.id}/certify`).send({ certifiedOn: daysAgo(1), version: firstNow.version });
    expect(res.status).toBe(409);
    expect(await api.ds.query('SELECT id FROM qualifications WHERE coupon_id = $1', [one.id])).toEqual([]);

    // after further training: one new test, certified on its own
    const trained = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { testedOn: daysAgo(3), examination: { bend: fourSound, retest: { of: failed.id, basis: 'after-training' } }, claimedResult: 'accept' }))
        .expect(201),
    );
    expect(trained.retestSet?.verdict).toMatchObject({ result: 'accept', needed: 1, clause: 'QW-321.4' });
    await qa.post(`/api/coupons/${trained.id}/certify`).send({ certifiedOn: daysAgo(1), version: trained.version }).expect(201);
  });

  it('refuses a retest in another position or before the failed test, naming the field, and saves nothing (from memory: ASME IX QW-321.2, each position failed)', async () => {
    const { qa, ids, failed } = await setup();
    const base = couponBody(ids, { examination: { bend: fourSound, retest: { of: failed.id, basis: 'immediate' } } });
    const elsewhere = await qa.post('/api/coupons').send({ ...base, coupon: { ...base.coupon, position: '5G' } });
    expect(elsewhere.status).toBe(400);
    expect(errorOf(elsewhere).fields?.['coupon.position']).toMatch(/position failed, 6G \(QW-321\.2\)/);
    const early = await qa.post('/api/coupons').send({ ...base, testedOn: daysAgo(25) });
    expect(early.status).toBe(400);
    expect(errorOf(early).fields?.testedOn).toMatch(/after the failed test/);
    const n = await api.ds.query<{ n: number }[]>('SELECT count(*)::int AS n FROM coupons WHERE retest_of_id = $1', [failed.id]);
    expect(n[0]?.n).toBe(0);
  });

  it('gives API 1104 one second opportunity, then only a retest after training (from memory: API 1104 6.7 retesting)', async () => {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'W-API', code: 'api-1104', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    const pipe = {
      code: 'api-1104' as const,
      process: 'SMAW' as const,
      form: 'pipe' as const,
      weld: 'groove' as const,
      position: '5G',
      thickness: inch(0.28),
      backing: false,
      fNumber: 3,
      progression: 'downhill' as const,
    };
    const rt = (result: 'accept' | 'reject') => ({
      volumetric: { method: 'radiography' as const, indications: [], examinerResult: result },
    });
    const body = (over: Parameters<typeof couponBody>[1]) =>
      couponBody(ids, { coupon: pipe, pipe: { nps: '6', schedule: '40' }, pNumbers: ['1'], ...over });
    const failed = bodyOf(
      couponRecordSchema,
      await qa.post('/api/coupons').send(body({ testedOn: daysAgo(20), examination: rt('reject'), claimedResult: 'reject' })).expect(201),
    );
    const second = bodyOf(
      couponRecordSchema,
      await qa.post('/api/coupons').send(body({ testedOn: daysAgo(15), examination: { ...rt('reject'), retest: { of: failed.id, basis: 'immediate' } } })).expect(201),
    );
    expect(second.retestSet?.verdict).toMatchObject({ result: 'reject', needed: 1, clause: 'API 1104 6.7 (welder retesting)' });
    const third = await qa.post('/api/coupons').send(body({ testedOn: daysAgo(10), examination: { ...rt('accept'), retest: { of: failed.id, basis: 'immediate' } } }));
    expect(third.status).toBe(400);
    expect(errorOf(third).fields?.['examination.retest']).toMatch(/further training/);
    const trained = await qa.post('/api/coupons').send(body({ testedOn: daysAgo(10), examination: { ...rt('accept'), retest: { of: failed.id, basis: 'after-training' } } }));
    expect(trained.status).toBe(201);
  });
});
