// Every mutation audited (issue 11). The test enumerates every mutating route the API router serves
// (POST, PUT, PATCH, DELETE), performs each one successfully as the role that may, and asserts that it
// wrote at least one row to the company's append-only audit trail, by the caller. A route that changes no
// record of the company declares its exemption below with the reason; a new mutating route with neither a
// recipe nor an exemption fails the test.
import type { Response } from 'supertest';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { couponRecordSchema, personSchema, qualificationSchema } from '@beadroll/rules';
import { servedRoutes } from '../../support/express-routes.js';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD, uniqueEmail } from '../../support/factories.js';
import { couponBody, daysAgo, makeProcedure, samplePng } from '../../support/api-records.js';
import { linkToken, waitForMail } from '../../support/mail.js';
import { check, csv, importFile, upload, waitForImport } from '../../support/imports.js';

/** Mutating routes that change no record of the company, and why. */
const EXEMPT: Record<string, string> = {
  'post /auth/login':
    'a sign-in opens a session row; it changes no record (sessions are listed on the Account page)',
  'post /auth/logout': "ends the caller's own session row; it changes no record",
  'post /auth/password-reset': 'only e-mails a link; using it (POST /auth/set-password) is audited',
  'post /imports': 'stages a file to be checked; no record changes until the commit, which is audited',
  'post /imports/:id/check': 'checks a staged file against the records and writes only its report',
  'post /imports/:id/cancel': 'discards a staged import; no record changed',
};

type Agent = ReturnType<typeof request.agent>;

describe('every mutation is audited', () => {
  let api: TestApi;
  let world: Awaited<ReturnType<typeof makeWorld>>;
  let qa: Agent;
  let foreman: Agent;
  const ctx: Record<string, string> = {};
  const month = new Date().toISOString().slice(0, 7);

  beforeAll(async () => {
    api = await startTestApi();
    world = await makeWorld(api.ds);
    qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    ctx.procedureId = (await makeProcedure(api.ds, world.org, { number: 'WPS-AUDIT' })).id;
  }, 60_000);
  afterAll(() => api.close());

  const ids = () => ({
    welderId: world.weldersA[0]!.id,
    shopId: world.shopA.id,
    procedureId: ctx.procedureId!,
  });

  /** How to perform each mutating route successfully, in an order where each finds what it needs. */
  const recipes: [string, () => Promise<Response>][] = [
    [
      'post /shops',
      async () => {
        const res = await qa.post('/api/shops').send({ name: 'Audit Hall', code: 'AU-1' });
        ctx.shopId = (res.body as { id: string }).id;
        return res;
      },
    ],
    [
      'patch /shops/:id',
      () => qa.patch(`/api/shops/${ctx.shopId}`).send({ name: 'Audit Hall East', code: 'AU-1' }),
    ],
    [
      'post /people',
      async () => {
        ctx.inviteEmail = uniqueEmail('audit-invite');
        const res = await qa
          .post('/api/people')
          .send({ email: ctx.inviteEmail, name: 'Ada Audit', role: 'qa_manager' });
        ctx.personId = bodyOf(personSchema, res).id;
        return res;
      },
    ],
    ['patch /people/:id', () => qa.patch(`/api/people/${ctx.personId}`).send({ name: 'Ada Audit-Hale' })],
    ['post /people/:id/invitation', () => qa.post(`/api/people/${ctx.personId}/invitation`)],
    [
      'post /auth/set-password',
      async () => {
        const token = linkToken(await waitForMail(api.config.mailDir, ctx.inviteEmail!, { count: 2 }));
        return request(api.app).post('/api/auth/set-password').send({ token, password: 'audited-pass-2026' });
      },
    ],
    [
      'post /auth/sessions/end-others',
      async () => {
        await signIn(api.app, ctx.inviteEmail!, 'audited-pass-2026');
        const me = await signIn(api.app, ctx.inviteEmail!, 'audited-pass-2026');
        return me.post('/api/auth/sessions/end-others');
      },
    ],
    [
      'delete /auth/sessions/:id',
      async () => {
        await signIn(api.app, ctx.inviteEmail!, 'audited-pass-2026');
        const me = await signIn(api.app, ctx.inviteEmail!, 'audited-pass-2026');
        const list = (await me.get('/api/auth/sessions').expect(200)).body as {
          items: { id: string; current: boolean }[];
        };
        const other = list.items.find((s) => !s.current)!;
        return me.delete(`/api/auth/sessions/${other.id}`);
      },
    ],
    [
      'post /welders',
      async () => {
        const res = await qa
          .post('/api/welders')
          .send({
            stamp: 'AU-9',
            name: 'Audit Welder',
            homeShopId: world.shopA.id,
            email: uniqueEmail('au9'),
          });
        ctx.welderId = (res.body as { id: string }).id;
        return res;
      },
    ],
    [
      'patch /welders/:id',
      () => qa.patch(`/api/welders/${ctx.welderId}`).send({ name: 'Audit Welder-Hale', version: 1 }),
    ],
    ['post /welders/:id/account', () => qa.post(`/api/welders/${ctx.welderId}/account`)],
    ['post /welders/:id/verify-token', () => qa.post(`/api/welders/${ctx.welderId}/verify-token`)],
    ['delete /welders/:id/verify-token', () => qa.delete(`/api/welders/${ctx.welderId}/verify-token`)],
    [
      'post /procedures',
      async () => {
        const res = await qa
          .post('/api/procedures')
          .send({
            number: 'AU-P1',
            revision: 'A',
            code: 'asme-ix',
            processes: ['SMAW'],
            pNumbers: ['1'],
            fNumber: 4,
          });
        ctx.newProcedureId = (res.body as { id: string }).id;
        return res;
      },
    ],
    [
      'patch /procedures/:id',
      () => qa.patch(`/api/procedures/${ctx.newProcedureId}`).send({ notes: 'Audited', version: 1 }),
    ],
    [
      'post /uploads',
      () => qa.post('/api/uploads').field('kind', 'other').attach('file', samplePng(), 'audit.png'),
    ],
    [
      'post /coupons',
      async () => {
        const res = await qa.post('/api/coupons').send(couponBody(ids()));
        ctx.couponId = bodyOf(couponRecordSchema, res).id;
        return res;
      },
    ],
    [
      'patch /coupons/:id',
      () => {
        const { welderId: _w, ...rest } = couponBody(ids());
        return qa
          .patch(`/api/coupons/${ctx.couponId}`)
          .send({ ...rest, labReportNumber: 'LR-AUDIT', version: 1 });
      },
    ],
    [
      'post /coupons/:id/certify',
      async () => {
        const res = await qa
          .post(`/api/coupons/${ctx.couponId}/certify`)
          .send({ certifiedOn: daysAgo(0), version: 2 });
        ctx.qualificationId = bodyOf(qualificationSchema, res).id;
        return res;
      },
    ],
    [
      'post /qualifications/:id/revoke',
      () =>
        qa
          .post(`/api/qualifications/${ctx.qualificationId}/revoke`)
          .send({ revokedOn: daysAgo(0), reason: 'Audit check of a revocation' }),
    ],
    [
      'put /continuity/grid',
      async () => {
        // A-02 tested 400 days ago and certified: lapsed, so use logged now is flagged for review.
        const old = couponBody({ ...ids(), welderId: world.weldersA[1]!.id }, { testedOn: daysAgo(400) });
        const c = bodyOf(couponRecordSchema, await qa.post('/api/coupons').send(old).expect(201));
        await qa
          .post(`/api/coupons/${c.id}/certify`)
          .send({ certifiedOn: daysAgo(399), version: 1 })
          .expect(201);
        return foreman.put('/api/continuity/grid').send({
          shopId: world.shopA.id,
          month,
          cells: [
            {
              welderId: world.weldersA[1]!.id,
              process: 'SMAW',
              usedOn: `${month}-01`,
              jobReference: 'J-AUDIT',
            },
          ],
        });
      },
    ],
    [
      'post /continuity/entries/:id/review',
      async () => {
        const [entry] = await api.ds.query<{ id: string }[]>(
          `SELECT id FROM continuity_entries WHERE welder_id = $1`,
          [world.weldersA[1]!.id],
        );
        return qa
          .post(`/api/continuity/entries/${entry!.id}/review`)
          .send({ decision: 'welds-examined', note: 'Audit: welds radiographed' });
      },
    ],
    [
      'post /welds',
      async () => {
        // A weld by a welder with no qualification: saved, flagged, and audited.
        const res = await foreman.post('/api/welds').send({
          shopId: world.shopA.id,
          jobReference: 'J-AUDIT',
          weldNumber: '1',
          weldedOn: `${month}-01`,
          joint: { form: 'plate', weld: 'groove', position: 'F', thickness: { value: 0.5, unit: 'in' }, backing: true },
          passes: [{ welderId: world.weldersA[1]!.id, process: 'GTAW', layer: 'all' }],
        });
        ctx.weldId = (res.body as { id: string }).id;
        return res;
      },
    ],
    [
      'post /welds/:id/disposition',
      () => qa.post(`/api/welds/${ctx.weldId}/disposition`).send({ decision: 'requalify', reason: 'Audit: to requalify for GTAW' }),
    ],
    ['patch /settings', () => qa.patch('/api/settings').send({ warnDays: [45, 14, 3] })],
    ['post /lapse-watch/runs', () => qa.post('/api/lapse-watch/runs').send({})],
    [
      'post /api-tokens',
      async () => {
        const res = await qa.post('/api/api-tokens').send({ name: 'Audit reader', access: 'read' });
        ctx.apiTokenId = (res.body as { apiToken: { id: string } }).apiToken.id;
        return res;
      },
    ],
    ['post /api-tokens/:id/revoke', () => qa.post(`/api/api-tokens/${ctx.apiTokenId}/revoke`)],
    [
      'post /imports/:id/commit',
      async () => {
        const staged = await upload(qa, 'welders', csv([['Stamp', 'Name', 'Shop'], ['AU-50', 'Imported Audit', 'AA']]), 'welders.csv');
        await check(qa, staged.id, staged.mapping);
        const res = await qa.post(`/api/imports/${staged.id}/commit`);
        await waitForImport(qa, staged.id);
        return res;
      },
    ],
    [
      'post /paper-records/:id/settle',
      async () => {
        const wpq = csv([
          ['Stamp', 'Code', 'Process', 'Test date', 'WPS', 'Plate or pipe', 'Groove or fillet', 'Test position', 'Thickness', 'Backing', 'F-No.', 'Paper: groove positions'],
          ['A-02', 'ASME IX', 'SMAW', daysAgo(40), 'WPS-AUDIT', 'plate', 'groove', '2G', '3/8', 'yes', '4', 'all'],
        ]);
        await importFile(qa, 'qualifications', wpq, 'paper wpqs.csv');
        const [p] = await api.ds.query<{ id: string }[]>(
          `SELECT qualification_id AS id FROM qualification_paper_records WHERE organization_id = $1`,
          [world.org.id],
        );
        return qa.post(`/api/paper-records/${p!.id}/settle`).send({ settlement: 'narrowed', note: 'The paper record governs' });
      },
    ],
  ];

  const auditCount = async () =>
    (
      await api.ds.query<{ n: number }[]>(
        `SELECT count(*)::int AS n FROM audit_events WHERE organization_id = $1`,
        [world.org.id],
      )
    )[0]!.n;

  it('writes an audit row for every mutating route, or the route declares why it changes no record', async () => {
    const mutating = servedRoutes(api.app, '/api')
      .filter((r) => r.method !== 'get' && r.method !== 'head' && r.method !== 'options')
      .map((r) => `${r.method} ${r.path}`);
    const known = new Map(recipes);
    const undeclared = mutating.filter((k) => !known.has(k) && !(k in EXEMPT));
    expect(
      undeclared,
      'add a recipe to audited.test.ts (and an audit row to the service), or an exemption with its reason',
    ).toEqual([]);
    expect(
      [...known.keys()].filter((k) => !mutating.includes(k)),
      'recipes for routes no longer served',
    ).toEqual([]);

    const missing: string[] = [];
    for (const [key, perform] of recipes) {
      const before = await auditCount();
      const res = await perform();
      if (res.status >= 300) {
        missing.push(`${key}: answered ${res.status} ${JSON.stringify(res.body)}`);
        continue;
      }
      const after = await auditCount();
      if (after <= before) missing.push(`${key}: ${res.status}, no audit row`);
    }
    console.log(
      `mutating routes: ${mutating.length}, performed and audited: ${recipes.length - missing.length}, exempt: ${Object.keys(EXEMPT).length}`,
    );
    expect(missing).toEqual([]);
  }, 180_000);
});
