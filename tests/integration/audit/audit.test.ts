import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditEventSchema, pageOf } from '@beadroll/rules';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const auditPage = pageOf(auditEventSchema);

describe('GET /api/audit', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('lists the changes of the company, newest first, with actor, before and after; filters by entity', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const welderId = world.weldersA[1]!.id;
    await qa.patch(`/api/welders/${welderId}`).send({ name: 'Bo Ferrand-Ames', version: 1 }).expect(200);
    await qa.patch(`/api/welders/${welderId}`).send({ homeShopId: world.shopB.id, version: 2 }).expect(200);
    await qa.patch(`/api/shops/${world.shopA.id}`).send({ location: 'Bay 3' }).expect(200);

    const all = bodyOf(auditPage, await qa.get('/api/audit').expect(200));
    expect(all.total).toBe(3);
    expect(all.items.map((e) => e.action)).toEqual(['shop.updated', 'welder.moved', 'welder.updated']);
    expect(all.items[0]).toMatchObject({
      actor: { id: world.qa.id, name: world.qa.name },
      entityType: 'shop',
      entityId: world.shopA.id,
      after: { location: 'Bay 3' },
    });

    const one = bodyOf(
      auditPage,
      await qa.get(`/api/audit?entityType=welder&entityId=${welderId}`).expect(200),
    );
    expect(one.items.map((e) => e.action)).toEqual(['welder.moved', 'welder.updated']);
    expect((await qa.get('/api/audit?entityId=nope')).status).toBe(400);
  });

  it("never shows another company's events", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const theirQa = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    await theirQa.patch(`/api/shops/${other.shop.id}`).send({ name: 'Zeta Works' }).expect(200);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const page = bodyOf(auditPage, await qa.get(`/api/audit?entityId=${other.shop.id}`).expect(200));
    expect(page).toMatchObject({ items: [], total: 0 });
  });

  it('is for QA managers only', async () => {
    const world = await makeWorld(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      expect((await agent.get('/api/audit')).status).toBe(403);
    }
  });
});

describe('the audit table is append-only', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('refuses UPDATE, DELETE and TRUNCATE, even from the owner of the table', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    await qa.patch(`/api/shops/${world.shopB.id}`).send({ name: 'Beta Yard West' }).expect(200);
    const [event] = await api.ds.query<{ id: string; action: string }[]>(
      `SELECT id, action FROM audit_events WHERE entity_id = $1`,
      [world.shopB.id],
    );
    expect(event?.action).toBe('shop.updated');

    await expect(
      api.ds.query(`UPDATE audit_events SET action = 'shop.nothing' WHERE id = $1`, [event!.id]),
    ).rejects.toThrow(/append-only/);
    await expect(api.ds.query(`DELETE FROM audit_events WHERE id = $1`, [event!.id])).rejects.toThrow(
      /append-only/,
    );
    await expect(api.ds.query(`TRUNCATE audit_events`)).rejects.toThrow(/append-only/);
    const [still] = await api.ds.query<{ action: string }[]>(
      `SELECT action FROM audit_events WHERE id = $1`,
      [event!.id],
    );
    expect(still?.action).toBe('shop.updated');
  });
});
