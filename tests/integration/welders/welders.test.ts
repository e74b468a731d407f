import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { welderPageSchema, welderSchema, personSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import {
  auditRows,
  makeOtherCompany,
  makeShop,
  makeWelder,
  makeWorld,
  TEST_PASSWORD,
  uniqueEmail,
  type WelderRow,
} from '../../support/factories.js';
import { QueryLog } from '../../support/api-query-log.js';
import { addMonths } from '@beadroll/rules';
import { makeQualification } from '../lapse-watch/lapse-factories.js';
import { linkToken, waitForMail } from '../../support/mail.js';

const stamps = (res: { body: unknown }) => bodyOf(welderPageSchema, res).items.map((w) => w.stamp);

describe('GET /api/welders', () => {
  let api: TestApi;
  const log = new QueryLog();
  beforeAll(async () => {
    api = await startTestApi({ dataSourceOptions: { logger: log } });
  });
  afterAll(() => api.close());

  it('sorts by the soonest lapse still ahead, lapsed ones never first, welders with none ahead last (issue 10 item 6)', async () => {
    const world = await makeWorld(api.ds);
    const today = new Date().toISOString().slice(0, 10);
    const day = (n: number) => new Date(Date.parse(`${today}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);
    const lapsedAndLater = await makeWelder(api.ds, world.org, world.shopA, { stamp: 'S-01' });
    const soonAhead = await makeWelder(api.ds, world.org, world.shopA, { stamp: 'S-02' });
    const onlyLapsed = await makeWelder(api.ds, world.org, world.shopA, { stamp: 'S-03' });
    const q = (w: WelderRow, process: string, lapsesOn: string) =>
      makeQualification(api.ds, world.org, world.qa, w, { process, lapsesOn, lastEvidence: addMonths(lapsesOn, -6) });
    await q(lapsedAndLater, 'SMAW', day(-10));
    await q(lapsedAndLater, 'GTAW', day(20));
    await q(soonAhead, 'SMAW', day(13));
    await q(onlyLapsed, 'SMAW', day(-40));
    // The maintained soonest lapse over the qualifications in force, as the continuity refresh keeps it.
    await api.ds.query(
      `UPDATE welders w SET soonest_lapses_on = (SELECT min(lapses_on) FROM continuity_states cs WHERE cs.welder_id = w.id)
        WHERE organization_id = $1`,
      [world.org.id],
    );
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const asc = await qa.get('/api/welders?q=S-0&sort=lapsesOn&dir=asc').expect(200);
    expect(stamps(asc)).toEqual(['S-02', 'S-01', 'S-03']);
    const item = bodyOf(welderPageSchema, asc).items[1]!;
    expect(item.qualifications!.map((x) => [x.process, x.state]).sort()).toEqual([
      ['GTAW', 'lapsing'],
      ['SMAW', 'lapsed'],
    ]);
  });

  it('pages, sorts and counts in one query, whatever the page size', async () => {
    const world = await makeWorld(api.ds);
    for (let i = 1; i <= 30; i++)
      await makeWelder(api.ds, world.org, i % 2 ? world.shopA : world.shopB, {
        stamp: `P-${String(i).padStart(2, '0')}`,
      });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);

    log.clear();
    const page2 = await qa.get('/api/welders?q=P-&sort=stamp&dir=desc&page=2&pageSize=12').expect(200);
    const body = bodyOf(welderPageSchema, page2);
    expect(body).toMatchObject({ total: 30, page: 2, pageSize: 12 });
    expect(body.items.map((w) => w.stamp)).toEqual(
      Array.from({ length: 12 }, (_, k) => `P-${String(18 - k).padStart(2, '0')}`),
    );
    // The session lookup and the page with its total: nothing per row.
    const selects = log.queries.filter((q) => /^\s*SELECT/i.test(q));
    expect(selects).toHaveLength(2);
    expect(selects.filter((q) => /FROM welders w JOIN shops/.test(q))).toHaveLength(1);

    const last = bodyOf(welderPageSchema, await qa.get('/api/welders?q=P-&page=3&pageSize=12').expect(200));
    expect(last.items).toHaveLength(6);
    expect(last.total).toBe(30);
    // A page past the end still says how many there are.
    const past = bodyOf(welderPageSchema, await qa.get('/api/welders?q=P-&page=9&pageSize=12').expect(200));
    expect(past).toMatchObject({ items: [], total: 30 });
    const none = bodyOf(welderPageSchema, await qa.get('/api/welders?q=nobody-by-this-name').expect(200));
    expect(none).toMatchObject({ items: [], total: 0 });
  });

  it('shows active welders by default, left ones on request, and all together', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect(stamps(await qa.get('/api/welders'))).toEqual(['A-01', 'A-02', 'B-01', 'B-02']);
    expect(stamps(await qa.get('/api/welders?status=left'))).toEqual(['A-03']);
    expect(stamps(await qa.get('/api/welders?status=all'))).toHaveLength(5);
  });

  it('filters by shop and by text on stamp or name (case-insensitive substring), and sorts by name and home shop', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect(stamps(await qa.get(`/api/welders?shopId=${world.shopB.id}`))).toEqual(['B-01', 'B-02']);
    expect(stamps(await qa.get('/api/welders?q=ferr'))).toEqual(['A-02']);
    expect(stamps(await qa.get('/api/welders?q=b-0'))).toEqual(['B-01', 'B-02']);
    expect(stamps(await qa.get(`/api/welders?q=ha&shopId=${world.shopB.id}`))).toEqual(['B-01']);
    // A literal % matches only a %, not everything.
    expect(stamps(await qa.get('/api/welders?q=%25'))).toEqual([]);
    expect(stamps(await qa.get('/api/welders?sort=name&dir=desc'))).toEqual(['B-02', 'B-01', 'A-02', 'A-01']);
    expect(stamps(await qa.get('/api/welders?sort=homeShop&dir=desc'))).toEqual([
      'B-02',
      'B-01',
      'A-02',
      'A-01',
    ]);
  });

  it('rejects a malformed query with 400 naming the parameters', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.get('/api/welders?sort=age&pageSize=500&shopId=x');
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {}).sort()).toEqual(['pageSize', 'shopId', 'sort']);
  });

  it("shows a foreman only the welders whose home shop is theirs: shop A's foreman cannot read shop B's welders", async () => {
    const world = await makeWorld(api.ds);
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    expect(stamps(await foreman.get('/api/welders'))).toEqual(['A-01', 'A-02']);
    expect(stamps(await foreman.get(`/api/welders?shopId=${world.shopB.id}`))).toEqual([]);
    expect((await foreman.get(`/api/welders/${world.weldersB[0]!.id}`)).status).toBe(404);
    expect((await foreman.get(`/api/welders/${world.weldersA[1]!.id}`)).status).toBe(200);
  });

  it('shows a welder only their own record', async () => {
    const world = await makeWorld(api.ds);
    const welder = await signIn(api.app, world.welder.email, TEST_PASSWORD);
    expect(stamps(await welder.get('/api/welders'))).toEqual(['A-01']);
    const own = bodyOf(welderSchema, await welder.get(`/api/welders/${world.weldersA[0]!.id}`).expect(200));
    expect(own).toMatchObject({ stamp: 'A-01', hasAccount: true, homeShop: { code: 'AA' } });
    expect((await welder.get(`/api/welders/${world.weldersA[1]!.id}`)).status).toBe(404);
  });

  it("never shows another company's welders: not in the list, 404 by id", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect(stamps(await qa.get('/api/welders?q=Z-01'))).toEqual([]);
    expect(stamps(await qa.get(`/api/welders?shopId=${other.shop.id}`))).toEqual([]);
    const res = await qa.get(`/api/welders/${other.welder.id}`);
    expect(res.status).toBe(404);
    expect(errorOf(res).code).toBe('not_found');
  });

  it('requires a session', async () => {
    expect((await request(api.app).get('/api/welders')).status).toBe(401);
  });
});

describe('POST /api/welders', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('adds a welder (201) with stamp upper-cased and e-mail lower-cased, audited', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post('/api/welders').send({
      stamp: ' a-09 ',
      name: 'Greta Marlowe',
      homeShopId: world.shopA.id,
      email: 'Greta@Factory.Example',
    });
    expect(res.status).toBe(201);
    const welder = bodyOf(welderSchema, res);
    expect(welder).toMatchObject({
      stamp: 'A-09',
      email: 'greta@factory.example',
      version: 1,
      active: true,
      hasAccount: false,
      homeShop: { id: world.shopA.id },
    });
    expect(await auditRows(api.ds, welder.id)).toEqual([
      expect.objectContaining({
        action: 'welder.created',
        actorId: world.qa.id,
        after: {
          stamp: 'A-09',
          name: 'Greta Marlowe',
          homeShopId: world.shopA.id,
          email: 'greta@factory.example',
          active: true,
        },
      }),
    ]);
  });

  it('refuses a stamp already used in the company, naming who has it, and saves nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/welders')
      .send({ stamp: 'a-02', name: 'Copy Cat', homeShopId: world.shopB.id });
    expect(res.status).toBe(400);
    expect(errorOf(res).fields).toEqual({ stamp: 'Stamp A-02 is already used by Bo Ferrand' });
    expect(
      await api.ds.query(`SELECT 1 FROM welders WHERE organization_id = $1`, [world.org.id]),
    ).toHaveLength(5);
  });

  it('accepts the same stamp in another company', async () => {
    await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    expect(
      (await qa.post('/api/welders').send({ stamp: 'A-01', name: 'Same Stamp', homeShopId: other.shop.id }))
        .status,
    ).toBe(201);
  });

  it("gives 400 with field names for a malformed body or another company's shop, and saves nothing", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const bad = await qa
      .post('/api/welders')
      .send({ stamp: 'has space', name: '', homeShopId: 'nope', email: 'nope' });
    expect(bad.status).toBe(400);
    expect(Object.keys(errorOf(bad).fields ?? {}).sort()).toEqual(['email', 'homeShopId', 'name', 'stamp']);
    const theirs = await qa
      .post('/api/welders')
      .send({ stamp: 'A-77', name: 'Wrong Shop', homeShopId: other.shop.id });
    expect(errorOf(theirs).fields).toEqual({ homeShopId: 'Choose a shop of your company' });
    expect(
      await api.ds.query(`SELECT 1 FROM welders WHERE organization_id = $1`, [world.org.id]),
    ).toHaveLength(5);
    expect(
      await api.ds.query(`SELECT 1 FROM audit_events WHERE organization_id = $1`, [world.org.id]),
    ).toHaveLength(0);
  });

  it('forbids foremen and welders to add welders (403)', async () => {
    const world = await makeWorld(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      expect(
        (await agent.post('/api/welders').send({ stamp: 'A-50', name: 'Nope', homeShopId: world.shopA.id }))
          .status,
      ).toBe(403);
    }
    expect(
      await api.ds.query(`SELECT 1 FROM welders WHERE organization_id = $1`, [world.org.id]),
    ).toHaveLength(5);
  });
});

describe('PATCH /api/welders/:id', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('edits with the current version, bumping it; a stale version gets 409 and changes nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const id = world.weldersA[1]!.id;
    const first = await qa.patch(`/api/welders/${id}`).send({ name: 'Bo Ferrand-Hale', version: 1 });
    expect(first.status).toBe(200);
    expect(bodyOf(welderSchema, first)).toMatchObject({ name: 'Bo Ferrand-Hale', version: 2 });

    const stale = await qa.patch(`/api/welders/${id}`).send({ name: 'Overwritten', version: 1 });
    expect(stale.status).toBe(409);
    expect(errorOf(stale).code).toBe('conflict');
    const [row] = await api.ds.query<{ name: string; version: number }[]>(
      `SELECT name, version FROM welders WHERE id = $1`,
      [id],
    );
    expect(row).toEqual({ name: 'Bo Ferrand-Hale', version: 2 });
    expect((await auditRows(api.ds, id)).map((e) => e.action)).toEqual(['welder.updated']);
  });

  it('moves a welder to another home shop, audited as welder.moved with both shops', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const id = world.weldersA[1]!.id;
    const res = await qa.patch(`/api/welders/${id}`).send({ homeShopId: world.shopB.id, version: 1 });
    expect(res.status).toBe(200);
    expect(bodyOf(welderSchema, res).homeShop.id).toBe(world.shopB.id);
    expect(await auditRows(api.ds, id)).toEqual([
      expect.objectContaining({
        action: 'welder.moved',
        actorId: world.qa.id,
        before: { homeShopId: world.shopA.id },
        after: { homeShopId: world.shopB.id },
      }),
    ]);
    // The foreman of shop A no longer sees the welder.
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    expect((await foreman.get(`/api/welders/${id}`)).status).toBe(404);
  });

  it('marks a welder as left and back, keeping the record', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const id = world.weldersB[0]!.id;
    await qa.patch(`/api/welders/${id}`).send({ active: false, version: 1 }).expect(200);
    const [left] = await api.ds.query<{ active: boolean; left_at: Date | null }[]>(
      `SELECT active, left_at FROM welders WHERE id = $1`,
      [id],
    );
    expect(left?.active).toBe(false);
    expect(left?.left_at).toBeInstanceOf(Date);
    await qa.patch(`/api/welders/${id}`).send({ active: true, version: 2 }).expect(200);
    const [back] = await api.ds.query<{ active: boolean; left_at: Date | null }[]>(
      `SELECT active, left_at FROM welders WHERE id = $1`,
      [id],
    );
    expect(back).toEqual({ active: true, left_at: null });
  });

  it('refuses a stamp taken by another welder and a missing version with 400, changing nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const id = world.weldersA[1]!.id;
    const taken = await qa.patch(`/api/welders/${id}`).send({ stamp: 'B-01', version: 1 });
    expect(errorOf(taken).fields).toEqual({ stamp: 'Stamp B-01 is already used by Di Harwick' });
    const noVersion = await qa.patch(`/api/welders/${id}`).send({ name: 'No Version' });
    expect(Object.keys(errorOf(noVersion).fields ?? {})).toEqual(['version']);
    const [row] = await api.ds.query<object[]>(`SELECT stamp, name, version FROM welders WHERE id = $1`, [
      id,
    ]);
    expect(row).toEqual({ stamp: 'A-02', name: 'Bo Ferrand', version: 1 });
  });

  it("forbids foremen and welders to edit (403) and gives 404 for another company's welder", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      expect(
        (
          await agent
            .patch(`/api/welders/${world.weldersA[0]!.id}`)
            .send({ name: 'Self Promoted', version: 1 })
        ).status,
      ).toBe(403);
    }
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect(
      (await qa.patch(`/api/welders/${other.welder.id}`).send({ name: 'Poached', version: 1 })).status,
    ).toBe(404);
    const [row] = await api.ds.query<{ name: string }[]>(`SELECT name FROM welders WHERE id = $1`, [
      other.welder.id,
    ]);
    expect(row?.name).toBe('Zed Ormond');
  });
});

describe('POST /api/welders/:id/account', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it("creates a welder sign-in for the welder's e-mail and sends the invitation; the link signs the welder in", async () => {
    const world = await makeWorld(api.ds);
    const shop = await makeShop(api.ds, world.org, 'CC');
    const email = uniqueEmail('gets-account');
    const w = await makeWelder(api.ds, world.org, shop, { stamp: 'C-01', name: 'Hal Brindle', email });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post(`/api/welders/${w.id}/account`);
    expect(res.status).toBe(201);
    expect(bodyOf(personSchema, res)).toMatchObject({
      email,
      role: 'welder',
      welderId: w.id,
      status: 'invited',
    });
    const token = linkToken(await waitForMail(api.config.mailDir, email));
    const set = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token, password: 'welder-password-1' });
    expect(set.status).toBe(200);
    expect(set.body).toMatchObject({ role: 'welder', welderId: w.id });
    expect(bodyOf(welderSchema, await qa.get(`/api/welders/${w.id}`)).hasAccount).toBe(true);
    const again = await qa.post(`/api/welders/${w.id}/account`);
    expect(again.status).toBe(400);
  });

  it('refuses a welder without an e-mail with 400 on email', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post(`/api/welders/${world.weldersA[1]!.id}/account`);
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {})).toEqual(['email']);
    expect(
      await api.ds.query(`SELECT 1 FROM users WHERE welder_id = $1`, [world.weldersA[1]!.id]),
    ).toHaveLength(0);
  });
});
