import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { personSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import {
  auditRows,
  makeOtherCompany,
  makeUser,
  makeWorld,
  TEST_PASSWORD,
  uniqueEmail,
} from '../../support/factories.js';
import { waitForMail } from '../../support/mail.js';

const personList = z.object({ items: z.array(personSchema) });

describe('/api/people', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('lists the people of the company only, with status and shops', async () => {
    const world = await makeWorld(api.ds);
    await makeOtherCompany(api.ds);
    const invited = await makeUser(api.ds, world.org, {
      role: 'qa_manager',
      invited: true,
      name: 'Ivy Invited',
    });
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const { items } = bodyOf(personList, await qa.get('/api/people').expect(200));
    expect(items.map((p) => p.id).sort()).toEqual(
      [world.qa.id, world.foreman.id, world.welder.id, invited.id].sort(),
    );
    const byId = new Map(items.map((p) => [p.id, p]));
    expect(byId.get(world.foreman.id)).toMatchObject({
      role: 'foreman',
      status: 'active',
      shops: [{ id: world.shopA.id, code: 'AA' }],
    });
    expect(byId.get(world.welder.id)).toMatchObject({
      role: 'welder',
      welderId: world.weldersA[0]!.id,
      shops: [{ code: 'AA' }],
    });
    expect(byId.get(invited.id)?.status).toBe('invited');
    expect(byId.get(world.qa.id)?.lastSignInAt).toEqual(expect.any(String));
  });

  it('forbids foremen and welders to list, invite or change people (403)', async () => {
    const world = await makeWorld(api.ds);
    for (const user of [world.foreman, world.welder]) {
      const agent = await signIn(api.app, user.email, TEST_PASSWORD);
      expect((await agent.get('/api/people')).status).toBe(403);
      const email = uniqueEmail('sneak');
      expect(
        (await agent.post('/api/people').send({ email, name: 'Sneak', role: 'qa_manager' })).status,
      ).toBe(403);
      expect((await agent.patch(`/api/people/${world.qa.id}`).send({ active: false })).status).toBe(403);
      expect(await api.ds.query(`SELECT 1 FROM users WHERE email = $1`, [email])).toHaveLength(0);
    }
    const [qaRow] = await api.ds.query<{ active: boolean }[]>(`SELECT active FROM users WHERE id = $1`, [
      world.qa.id,
    ]);
    expect(qaRow?.active).toBe(true);
  });

  it('invites a foreman with shops: 201, invitation e-mail, audit event', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('foreman');
    const res = await qa.post('/api/people').send({
      email: email.toUpperCase(),
      name: 'Fay Newcombe',
      role: 'foreman',
      shopIds: [world.shopA.id, world.shopB.id],
    });
    expect(res.status).toBe(201);
    const person = bodyOf(personSchema, res);
    expect(person).toMatchObject({
      email,
      status: 'invited',
      shops: [{ code: 'AA' }, { code: 'BB' }],
      lastSignInAt: null,
    });
    expect((await waitForMail(api.config.mailDir, email)).text).toContain('Fay Newcombe');
    expect(await auditRows(api.ds, person.id)).toEqual([
      expect.objectContaining({
        action: 'person.invited',
        actorId: world.qa.id,
        after: {
          email,
          name: 'Fay Newcombe',
          role: 'foreman',
          shopIds: [world.shopA.id, world.shopB.id],
          welderId: null,
        },
      }),
    ]);
  });

  it('refuses an e-mail that is already a person of the company (400 on email), saving nothing', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/people')
      .send({ email: world.foreman.email, name: 'Double', role: 'qa_manager' });
    expect(res.status).toBe(400);
    expect(errorOf(res).fields).toEqual({ email: `${world.foreman.email} is already a person of your company` });
    expect(await api.ds.query(`SELECT 1 FROM users WHERE organization_id = $1`, [world.org.id])).toHaveLength(
      3,
    );
  });

  it('gives 400 with field names for malformed invitations and saves nothing', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const cases: [Record<string, unknown>, string[]][] = [
      [{ email: uniqueEmail('f'), name: 'No Shops', role: 'foreman' }, ['shopIds']],
      [{ email: uniqueEmail('w'), name: 'No Welder', role: 'welder' }, ['welderId']],
      [{ email: uniqueEmail('r'), name: 'Bad Role', role: 'boss' }, ['role']],
      [
        { email: uniqueEmail('o'), name: 'Their Shop', role: 'foreman', shopIds: [other.shop.id] },
        ['shopIds'],
      ],
      [
        { email: uniqueEmail('t'), name: 'Taken Welder', role: 'welder', welderId: world.weldersA[0]!.id },
        ['welderId'],
      ],
      [
        { email: uniqueEmail('x'), name: 'Their Welder', role: 'welder', welderId: other.welder.id },
        ['welderId'],
      ],
    ];
    for (const [body, fields] of cases) {
      const res = await qa.post('/api/people').send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(Object.keys(errorOf(res).fields ?? {})).toEqual(fields);
    }
    expect(await api.ds.query(`SELECT 1 FROM users WHERE organization_id = $1`, [world.org.id])).toHaveLength(
      3,
    );
    expect(
      await api.ds.query(`SELECT 1 FROM audit_events WHERE organization_id = $1`, [world.org.id]),
    ).toHaveLength(0);
  });

  it("replaces a foreman's shop assignments; the foreman's view follows at once", async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const foreman = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    const res = await qa.patch(`/api/people/${world.foreman.id}`).send({ shopIds: [world.shopB.id] });
    expect(res.status).toBe(200);
    expect(bodyOf(personSchema, res).shops.map((s) => s.code)).toEqual(['BB']);
    const welders = z
      .object({ items: z.array(z.object({ stamp: z.string() })) })
      .parse((await foreman.get('/api/welders').expect(200)).body);
    expect(welders.items.map((w) => w.stamp)).toEqual(['B-01', 'B-02']);
    expect(await auditRows(api.ds, world.foreman.id)).toEqual([
      expect.objectContaining({
        action: 'person.updated',
        before: { shopIds: [world.shopA.id] },
        after: { shopIds: [world.shopB.id] },
      }),
    ]);
    const empty = await qa.patch(`/api/people/${world.foreman.id}`).send({ shopIds: [] });
    expect(errorOf(empty).fields).toEqual({ shopIds: 'Assign the foreman to at least one shop' });
    const notForeman = await qa.patch(`/api/people/${world.welder.id}`).send({ shopIds: [world.shopB.id] });
    expect(Object.keys(errorOf(notForeman).fields ?? {})).toEqual(['shopIds']);
  });

  it('deactivates a person, who then cannot sign in; a QA manager cannot deactivate themselves', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.patch(`/api/people/${world.welder.id}`).send({ active: false });
    expect(res.status).toBe(200);
    expect(bodyOf(personSchema, res).status).toBe('deactivated');
    await expect(signIn(api.app, world.welder.email, TEST_PASSWORD)).rejects.toThrow(/401/);
    expect((await auditRows(api.ds, world.welder.id)).map((e) => e.action)).toEqual(['person.deactivated']);

    const self = await qa.patch(`/api/people/${world.qa.id}`).send({ active: false });
    expect(self.status).toBe(400);
    expect(errorOf(self).fields).toEqual({ active: 'You cannot deactivate your own account' });
  });

  it("answers 404 for another company's person", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.get(`/api/people/${other.qa.id}`)).status).toBe(404);
    expect((await qa.patch(`/api/people/${other.qa.id}`).send({ active: false })).status).toBe(404);
    expect((await qa.post(`/api/people/${other.qa.id}/invitation`)).status).toBe(404);
    const [row] = await api.ds.query<{ active: boolean }[]>(`SELECT active FROM users WHERE id = $1`, [
      other.qa.id,
    ]);
    expect(row?.active).toBe(true);
  });
});
