// Finding 7 (issue 11): inviting an address that already signs in for another company must neither tell
// the inviter so ("already has an account") nor let the invitation take that account over. The inviter
// gets the same answer as for any new address; the address's owner is told, on using the link, that
// the address already signs in elsewhere; the existing account, its password and sessions stay as they were.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { personSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD, uniqueEmail } from '../../support/factories.js';
import { linkToken, waitForMail } from '../../support/mail.js';

const passwordOf = async (api: TestApi, id: string) =>
  (await api.ds.query<{ h: string | null }[]>(`SELECT password_hash AS h FROM users WHERE id = $1`, [id]))[0]
    ?.h;

describe('inviting an address that signs in for another company', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('answers exactly as for a new address, and e-mails the invitation to the address', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const fresh = await qa
      .post('/api/people')
      .send({ email: uniqueEmail('fresh'), name: 'Fresh Face', role: 'qa_manager' });
    const taken = await qa
      .post('/api/people')
      .send({ email: other.qa.email, name: 'Fresh Face', role: 'qa_manager' });
    expect(taken.status).toBe(fresh.status);
    expect(taken.status).toBe(201);
    const a = bodyOf(personSchema, fresh);
    const b = bodyOf(personSchema, taken);
    expect(Object.keys(b).sort()).toEqual(Object.keys(a).sort());
    expect({ ...b, id: '', email: '', createdAt: '' }).toEqual({ ...a, id: '', email: '', createdAt: '' });
    expect(b.status).toBe('invited');
    // The company's own list shows the invitation like any other.
    const list = (await qa.get('/api/people').expect(200)).body as {
      items: { id: string; status: string }[];
    };
    expect(list.items.find((p) => p.id === b.id)?.status).toBe('invited');
    const mail = await waitForMail(api.config.mailDir, other.qa.email);
    expect(mail.text).toContain(world.org.name);
  });

  it("never lets the link touch the other company's account: refused with a clear message, password and sessions kept", async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const theirs = await signIn(api.app, other.qa.email, TEST_PASSWORD);
    const hashBefore = await passwordOf(api, other.qa.id);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const invited = bodyOf(
      personSchema,
      await qa
        .post('/api/people')
        .send({ email: other.qa.email, name: 'Taken Over', role: 'qa_manager' })
        .expect(201),
    );
    const token = linkToken(await waitForMail(api.config.mailDir, other.qa.email));

    const info = await request(api.app).get(`/api/auth/tokens/${encodeURIComponent(token)}`);
    expect(info.status).toBe(409);
    expect(errorOf(info).message).toMatch(/already signs in to Beadroll for another company/);
    const use = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token, password: 'taken-over-2026' });
    expect(use.status).toBe(409);
    expect(errorOf(use).message).toMatch(/Your existing sign-in is unchanged/);
    expect(use.headers['set-cookie']).toBeUndefined();

    expect(await passwordOf(api, other.qa.id)).toBe(hashBefore);
    expect(await passwordOf(api, invited.id)).toBeNull();
    await theirs.get('/api/me').expect(200);
    expect(
      (
        await request(api.app)
          .post('/api/auth/login')
          .send({ email: other.qa.email, password: 'taken-over-2026' })
      ).status,
    ).toBe(401);
    const me = await (await signIn(api.app, other.qa.email, TEST_PASSWORD)).get('/api/me').expect(200);
    expect((me.body as { organization: { id: string } }).organization.id).toBe(other.org.id);
  });

  it('sends a password reset of the address to the account that signs in, not to the invitation', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const invited = bodyOf(
      personSchema,
      await qa
        .post('/api/people')
        .send({ email: other.qa.email, name: 'Reset Me', role: 'qa_manager' })
        .expect(201),
    );
    await waitForMail(api.config.mailDir, other.qa.email);
    await request(api.app).post('/api/auth/password-reset').send({ email: other.qa.email }).expect(202);
    const token = linkToken(await waitForMail(api.config.mailDir, other.qa.email, { count: 2 }));
    const set = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token, password: 'reset-for-real-2026' });
    expect(set.status).toBe(200);
    expect((set.body as { organization: { id: string } }).organization.id).toBe(other.org.id);
    expect(await passwordOf(api, invited.id)).toBeNull();
  });

  it("still refuses an address that is already a person of the inviter's own company (400 on email)", async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/people')
      .send({ email: world.foreman.email, name: 'Twice', role: 'qa_manager' });
    expect(res.status).toBe(400);
    expect(errorOf(res).fields).toEqual({
      email: `${world.foreman.email} is already a person of your company`,
    });
  });
});
