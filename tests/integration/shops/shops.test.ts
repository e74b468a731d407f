import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { z } from 'zod';
import { shopSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { auditRows, makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const shopList = z.object({ items: z.array(shopSchema) });

describe('/api/shops', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('lists every shop of the company to a QA manager, with active welder counts and foremen', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const { items } = bodyOf(shopList, await qa.get('/api/shops').expect(200));
    expect(items.map((s) => [s.code, s.welderCount])).toEqual([
      ['AA', 2], // A-03 has left
      ['BB', 2],
    ]);
    expect(items[0]!.foremen).toEqual([{ id: world.foreman.id, name: world.foreman.name }]);
  });

  it('lists only assigned shops to a foreman and only the home shop to a welder', async () => {
    const world = await makeWorld(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      const { items } = bodyOf(shopList, await agent.get('/api/shops').expect(200));
      expect(items.map((s) => s.id)).toEqual([world.shopA.id]);
      expect((await agent.get(`/api/shops/${world.shopB.id}`)).status).toBe(404);
    }
  });

  it('lets a QA manager create a shop (201), audited', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/shops')
      .send({ name: '  Gamma Line ', code: 'gl-1', location: 'North yard' });
    expect(res.status).toBe(201);
    const shop = bodyOf(shopSchema, res);
    expect(shop).toMatchObject({
      name: 'Gamma Line',
      code: 'GL-1',
      location: 'North yard',
      active: true,
      welderCount: 0,
      foremen: [],
    });
    const audit = await auditRows(api.ds, shop.id);
    expect(audit).toEqual([
      expect.objectContaining({
        action: 'shop.created',
        actorId: world.qa.id,
        before: null,
        after: { name: 'Gamma Line', code: 'GL-1', location: 'North yard', active: true },
      }),
    ]);
  });

  it('refuses a code already used in the company with 400 on code, and saves nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post('/api/shops').send({ name: 'Another Alpha', code: 'AA' });
    expect(res.status).toBe(400);
    expect(errorOf(res).fields).toEqual({ code: 'Code AA is already used by Alpha Bay' });
    expect(await api.ds.query(`SELECT 1 FROM shops WHERE organization_id = $1`, [world.org.id])).toHaveLength(
      2,
    );
  });

  it('allows the same code in another company', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    expect((await qa.post('/api/shops').send({ name: 'Their Alpha', code: 'AA' })).status).toBe(201);
    expect(world.shopA.code).toBe('AA');
  });

  it('gives 400 with field names for a malformed body and changes nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post('/api/shops').send({ name: '', code: 'no spaces allowed', location: 7 });
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {}).sort()).toEqual(['code', 'location', 'name']);
    const patch = await qa.patch(`/api/shops/${world.shopA.id}`).send({ name: 'Renamed', active: 'yes' });
    expect(patch.status).toBe(400);
    expect(Object.keys(errorOf(patch).fields ?? {})).toEqual(['active']);
    const [row] = await api.ds.query<{ name: string }[]>(`SELECT name FROM shops WHERE id = $1`, [
      world.shopA.id,
    ]);
    expect(row?.name).toBe('Alpha Bay');
  });

  it('lets a QA manager rename and deactivate a shop, audited with before and after', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .patch(`/api/shops/${world.shopB.id}`)
      .send({ name: 'Beta Yard East', active: false });
    expect(res.status).toBe(200);
    expect(bodyOf(shopSchema, res)).toMatchObject({ name: 'Beta Yard East', active: false });
    expect(await auditRows(api.ds, world.shopB.id)).toEqual([
      expect.objectContaining({
        action: 'shop.updated',
        before: { name: 'Beta Yard', active: true },
        after: { name: 'Beta Yard East', active: false },
      }),
    ]);
  });

  it('forbids foremen and welders to create or change shops (403), changing nothing', async () => {
    const world = await makeWorld(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      const post = await agent.post('/api/shops').send({ name: 'Sneaky', code: 'SN' });
      expect(post.status).toBe(403);
      expect(errorOf(post).code).toBe('forbidden');
      expect((await agent.patch(`/api/shops/${world.shopA.id}`).send({ name: 'Mine now' })).status).toBe(403);
    }
    expect(await api.ds.query(`SELECT 1 FROM shops WHERE organization_id = $1`, [world.org.id])).toHaveLength(
      2,
    );
  });

  it("answers 404 for another company's shop, for reading and for changing", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.get(`/api/shops/${other.shop.id}`)).status).toBe(404);
    const patch = await qa.patch(`/api/shops/${other.shop.id}`).send({ name: 'Taken over' });
    expect(patch.status).toBe(404);
    expect(errorOf(patch).code).toBe('not_found');
    const [row] = await api.ds.query<{ name: string }[]>(`SELECT name FROM shops WHERE id = $1`, [
      other.shop.id,
    ]);
    expect(row?.name).toBe('Zeta Shop');
    expect((await qa.get('/api/shops/not-a-uuid')).status).toBe(404);
  });

  it('requires a session', async () => {
    expect((await request(api.app).get('/api/shops')).status).toBe(401);
    expect((await request(api.app).post('/api/shops').send({ name: 'Anon', code: 'AN' })).status).toBe(401);
  });
});
