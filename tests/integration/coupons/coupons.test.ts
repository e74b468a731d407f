import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, qualificationSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { couponBody, daysAgo, disc, makeProcedure } from '../../support/api-records.js';

describe('coupons: record, evaluate, certify', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  async function setup() {
    const world = await makeWorld(api.ds);
    const wps = await makeProcedure(api.ds, world.org, { number: 'S-101', processes: ['SMAW'] });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const ids = { welderId: world.weldersA[0]!.id, shopId: world.shopA.id, procedureId: wps.id };
    return { world, wps, qa, ids };
  }

  it('runs the whole flow: WPS → coupon with bends → evaluation → certify → ranges with their clauses (ASME IX 6G, from memory: QW-461.9 all positions; QW-452.3 1 in OD and over for 2-7/8 in and under)', async () => {
    const { world, qa } = await setup();
    const created = await qa
      .post('/api/procedures')
      .send({
        number: 'HP-S200',
        revision: 'B',
        code: 'asme-ix',
        processes: ['SMAW'],
        pNumbers: ['1'],
        fNumber: 4,
      })
      .expect(201);
    const body = couponBody(
      {
        welderId: world.weldersA[0]!.id,
        shopId: world.shopA.id,
        procedureId: (created.body as { id: string }).id,
      },
      { claimedResult: 'accept' },
    );
    const res = await qa.post('/api/coupons').send(body).expect(201);
    const coupon = bodyOf(couponRecordSchema, res);
    expect(coupon).toMatchObject({
      result: 'accept',
      reasons: [],
      criteriaId: 'asme-ix',
      welder: { stamp: 'A-01' },
      procedure: { number: 'HP-S200', revision: 'B' },
      qualificationId: null,
      version: 1,
    });
    // The pipe size filled in the OD: NPS 2 is 2.375 in OD (ASME B36.10M, published).
    expect(coupon.coupon.outsideDiameter).toEqual({ value: 2.375, unit: 'in' });
    expect(coupon.rulesVersion).toMatch(/^\d+\.\d+\.\d+$/);

    const cert = await qa
      .post(`/api/coupons/${coupon.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: coupon.version })
      .expect(201);
    const q = bodyOf(qualificationSchema, cert);
    expect(q).toMatchObject({
      couponId: coupon.id,
      code: 'asme-ix',
      process: 'SMAW',
      certifiedOn: daysAgo(8),
      certifiedBy: { id: world.qa.id, name: world.qa.name },
      revokedOn: null,
      supersededById: null,
    });
    const ranges = q.ranges as {
      positions: { groove: string[] };
      diameter: { min: { value: number; unit: string } };
      fNumbers: number[];
      limits: { variable: string; clause: string }[];
    };
    expect(ranges.positions.groove).toEqual(['F', 'H', 'V', 'O']);
    expect(ranges.diameter.min).toEqual({ value: 1, unit: 'in' });
    // from memory: QW-433, F-No. 4 without backing qualifies F-No. 1–4.
    expect(ranges.fNumbers).toEqual([1, 2, 3, 4]);
    expect(ranges.limits.length).toBeGreaterThan(3);
    for (const l of ranges.limits) expect(l.clause).not.toBe('');
    // from memory: QW-322.1(a), six months from the test.
    expect(q.status.state).toBe('current');

    const again = bodyOf(couponRecordSchema, await qa.get(`/api/coupons/${coupon.id}`).expect(200));
    expect(again.qualificationId).toBe(q.id);
    expect((await auditRows(api.ds, coupon.id)).map((a) => a.action)).toEqual(['coupon.created']);
    const qAudit = await auditRows(api.ds, q.id);
    expect(qAudit).toMatchObject([
      { action: 'qualification.certified', entityType: 'qualification', before: null },
    ]);
  });

  it('keeps a failing coupon with its reasons (ASME IX QW-163, published: over 1/8 in rejects) and certifies the retest that passes', async () => {
    const { qa, ids } = await setup();
    const failing = couponBody(ids, {
      examination: {
        method: 'bend',
        criteria: 'asme-ix',
        specimens: [
          { label: 'F1', kind: 'face', discontinuities: [] },
          { label: 'F2', kind: 'face', discontinuities: [] },
          {
            label: 'R1',
            kind: 'root',
            discontinuities: [disc('3/16', { value: 0.1875, unit: 'in' }, { type: 'crack' })],
          },
          { label: 'R2', kind: 'root', discontinuities: [] },
        ],
      },
    });
    const first = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(failing).expect(201));
    expect(first.result).toBe('reject');
    expect(first.reasons[0]?.clause).toMatch(/QW-163/);
    expect(first.reasons[0]?.message).toMatch(/^R1 \(root\): /);
    expect(first.examination.bend?.specimens.map((s) => s.result)).toEqual(['accept', 'accept', 'reject', 'accept']);

    const refused = await qa
      .post(`/api/coupons/${first.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: 1 });
    expect(refused.status).toBe(409);
    expect(errorOf(refused).message).toBe('Only a passing coupon can be certified');

    const retest = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { testedOn: daysAgo(5), labReportNumber: 'LR-T-002' }))
        .expect(201),
    );
    expect(retest.result).toBe('accept');
    await qa
      .post(`/api/coupons/${retest.id}/certify`)
      .send({ certifiedOn: daysAgo(4), version: 1 })
      .expect(201);
    const list = await qa.get(`/api/coupons?welderId=${ids.welderId}`).expect(200);
    const items = (list.body as { items: { id: string; result: string }[] }).items;
    expect(items.map((i) => [i.id, i.result])).toEqual([
      [retest.id, 'accept'],
      [first.id, 'reject'],
    ]);
    const rejects = await qa.get(`/api/coupons?welderId=${ids.welderId}&result=reject`).expect(200);
    expect((rejects.body as { items: unknown[] }).items).toHaveLength(1);
  });

  it('rejects on a visual reject even when the bends pass (from memory: ASME IX QW-302.4, QW-194)', async () => {
    const { qa, ids } = await setup();
    const c = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody(ids, { visual: 'reject' }))
        .expect(201),
    );
    expect(c.result).toBe('reject');
    expect(c.reasons[0]).toMatchObject({
      clause: 'QW-302.4, QW-194',
      message: 'The examiner rejected the weld on visual examination.',
    });
  });

  it('takes the RT result instead of bends', async () => {
    const { qa, ids } = await setup();
    const c = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(
          couponBody(ids, { examination: { method: 'radiography', result: 'reject', reportNumber: 'RT-9' } }),
        )
        .expect(201),
    );
    expect(c).toMatchObject({
      result: 'reject',
      criteriaId: null,
      examination: { volumetric: { method: 'radiography', examinerResult: 'reject', reportNumber: 'RT-9', report: null } },
    });
    expect(c.reasons[0]?.message).toBe('The examination report rejects the weld.');
  });

  it('refuses a claimed result that disagrees, saving nothing', async () => {
    const { qa, ids } = await setup();
    const body = couponBody(ids, {
      claimedResult: 'accept',
      examination: {
        method: 'bend',
        criteria: 'asme-ix',
        specimens: [
          { label: 'F1', kind: 'face', discontinuities: [] },
          { label: 'F2', kind: 'face', discontinuities: [] },
          { label: 'R1', kind: 'root', discontinuities: [disc('4 mm', { value: 4, unit: 'mm' })] },
          { label: 'R2', kind: 'root', discontinuities: [] },
        ],
      },
    });
    const res = await qa.post('/api/coupons').send(body);
    expect(res.status).toBe(400);
    expect(errorOf(res).fields?.claimedResult).toMatch(/^The evaluation gives Reject, not Accept: R1 \(root\): /);
    const [n] = await api.ds.query<{ n: number }[]>(
      `SELECT count(*)::int AS n FROM coupons WHERE welder_id = $1`,
      [ids.welderId],
    );
    expect(n!.n).toBe(0);
  });

  it('refuses a size that does not match what was typed, and one that is not a length', async () => {
    const { qa, ids } = await setup();
    const res = await qa.post('/api/coupons').send(
      couponBody(ids, {
        examination: {
          method: 'bend',
          criteria: 'asme-ix',
          specimens: [
            {
              kind: 'face',
              discontinuities: [
                disc('1/8', { value: 0.125, unit: 'in' }),
                disc('3/16', { value: 0.1, unit: 'in' }),
              ],
            },
            { kind: 'root', discontinuities: [disc('three', { value: 3, unit: 'mm' })] },
          ],
        },
      }),
    );
    expect(res.status).toBe(400);
    const fields = errorOf(res).fields ?? {};
    expect(Object.keys(fields).sort()).toEqual([
      'examination.bend.specimens.0.discontinuities.1.size',
      'examination.bend.specimens.1.discontinuities.0.sizeText',
    ]);
  });

  it('refuses a superseded WPS, another code and another process on fields.procedureId', async () => {
    const { world, qa, ids } = await setup();
    const old = await makeProcedure(api.ds, world.org, {
      number: '123',
      revision: 'B',
      status: 'superseded',
    });
    const aws = await makeProcedure(api.ds, world.org, { number: 'D-1', code: 'aws-d1.1' });
    const gtaw = await makeProcedure(api.ds, world.org, { number: 'T-1', processes: ['GTAW'] });
    const msg = async (procedureId: string) =>
      errorOf(
        await qa
          .post('/api/coupons')
          .send(couponBody({ ...ids, procedureId }))
          .expect(400),
      ).fields?.procedureId;
    expect(await msg(old.id)).toBe('WPS 123 rev B is superseded');
    expect(await msg(aws.id)).toBe('WPS D-1 rev A is for AWS D1.1, not ASME IX');
    expect(await msg(gtaw.id)).toBe('WPS T-1 rev A does not cover SMAW');
    const other = await makeOtherCompany(api.ds);
    const foreign = await makeProcedure(api.ds, other.org, { number: 'X-1' });
    expect(await msg(foreign.id)).toMatch(/register/);
  });

  it('refuses an impossible coupon with the rules fields under coupon. (API 1104 plate: from memory, pipe only)', async () => {
    const { world, qa, ids } = await setup();
    const pl = await makeProcedure(api.ds, world.org, { number: 'P-1', code: 'api-1104' });
    const res = await qa.post('/api/coupons').send(
      couponBody(
        { ...ids, procedureId: pl.id },
        {
          pipe: null,
          coupon: {
            code: 'api-1104',
            process: 'SMAW',
            form: 'plate',
            weld: 'groove',
            position: '3G',
            thickness: { value: 0.375, unit: 'in' },
            backing: false,
            progression: 'downhill',
          },
          examination: {
            method: 'bend',
            criteria: 'api-1104',
            specimens: [{ kind: 'face', discontinuities: [] }],
          },
        },
      ),
    );
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {}).every((k) => k.startsWith('coupon'))).toBe(true);
  });

  it('edits with the version, 409 on a stale one, and refuses edits once certified', async () => {
    const { qa, ids } = await setup();
    const c = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(couponBody(ids)).expect(201));
    const { welderId: _w, ...rest } = couponBody(ids);
    const edited = bodyOf(
      couponRecordSchema,
      await qa
        .patch(`/api/coupons/${c.id}`)
        .send({ ...rest, labReportNumber: 'LR-T-009', version: 1 })
        .expect(200),
    );
    expect(edited).toMatchObject({ labReportNumber: 'LR-T-009', version: 2 });
    const stale = await qa.patch(`/api/coupons/${c.id}`).send({ ...rest, notes: 'late', version: 1 });
    expect(stale.status).toBe(409);
    expect(errorOf(stale).code).toBe('conflict');
    expect((await auditRows(api.ds, c.id)).map((a) => a.action)).toEqual([
      'coupon.created',
      'coupon.updated',
    ]);
    const audit = (await auditRows(api.ds, c.id))[1]!;
    expect(audit).toMatchObject({
      before: { labReportNumber: 'LR-T-001' },
      after: { labReportNumber: 'LR-T-009' },
    });

    const staleCert = await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: 1 });
    expect(staleCert.status).toBe(409);
    await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: daysAgo(8), version: 2 })
      .expect(201);
    const twice = await qa.post(`/api/coupons/${c.id}/certify`).send({ certifiedOn: daysAgo(8), version: 2 });
    expect(twice.status).toBe(409);
    expect(errorOf(twice).message).toBe('This coupon is already certified');
    const locked = await qa.patch(`/api/coupons/${c.id}`).send({ ...rest, version: 2 });
    expect(locked.status).toBe(409);
    expect(errorOf(locked).message).toBe('Certified coupons cannot be edited; record a new coupon');
  });

  it('refuses a certification date before the test or in the future', async () => {
    const { qa, ids } = await setup();
    const c = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(couponBody(ids)).expect(201));
    const early = await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: daysAgo(30), version: 1 });
    expect(errorOf(early).fields).toHaveProperty('certifiedOn');
    const future = await qa
      .post(`/api/coupons/${c.id}/certify`)
      .send({ certifiedOn: '2999-01-01', version: 1 });
    expect(errorOf(future).fields).toHaveProperty('certifiedOn');
  });

  it('refuses another company’s welder or shop on their fields', async () => {
    const { qa, ids } = await setup();
    const other = await makeOtherCompany(api.ds);
    const res = await qa.post('/api/coupons').send(couponBody({ ...ids, welderId: other.welder.id }));
    expect(errorOf(res).fields).toHaveProperty('welderId');
    const res2 = await qa.post('/api/coupons').send(couponBody({ ...ids, shopId: other.shop.id }));
    expect(errorOf(res2).fields).toHaveProperty('shopId');
  });

  it('lets a foreman read the coupons of their shops but not write; a welder reads only their own', async () => {
    const { world, qa, ids } = await setup();
    const mine = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(couponBody(ids)).expect(201));
    const theirs = bodyOf(
      couponRecordSchema,
      await qa
        .post('/api/coupons')
        .send(couponBody({ ...ids, welderId: world.weldersB[0]!.id, shopId: world.shopB.id }))
        .expect(201),
    );
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    const fl = (await foreman.get('/api/coupons').expect(200)).body as { items: { id: string }[] };
    expect(fl.items.map((i) => i.id)).toEqual([mine.id]);
    expect((await foreman.get(`/api/coupons/${theirs.id}`)).status).toBe(404);
    expect((await foreman.post('/api/coupons').send(couponBody(ids))).status).toBe(403);
    expect(
      (await foreman.post(`/api/coupons/${mine.id}/certify`).send({ certifiedOn: daysAgo(8), version: 1 }))
        .status,
    ).toBe(403);

    const welder = await signIn(api.app, world.welder.email, TEST_PASSWORD);
    await welder.get(`/api/coupons/${mine.id}`).expect(200);
    expect((await welder.get(`/api/coupons/${theirs.id}`)).status).toBe(404);
    expect((await welder.post('/api/coupons').send(couponBody(ids))).status).toBe(403);
  });
});
