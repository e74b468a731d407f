import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { meSchema } from '@beadroll/rules';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeUser, makeWorld, TEST_PASSWORD } from '../../support/factories.js';

describe('POST /api/auth/login', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi({ config: { loginRateLimit: 3 } });
  });
  afterAll(() => api.close());

  it('signs in with the right password: an httpOnly SameSite=Lax session cookie and the profile', async () => {
    const world = await makeWorld(api.ds);
    const res = await request(api.app)
      .post('/api/auth/login')
      .send({ email: world.qa.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(meSchema.parse(res.body).email).toBe(world.qa.email);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/^beadroll_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    const [row] = await api.ds.query<{ last_sign_in_at: Date | null }[]>(
      `SELECT last_sign_in_at FROM users WHERE id = $1`,
      [world.qa.id],
    );
    expect(row?.last_sign_in_at).toBeInstanceOf(Date);
  });

  it('refuses a wrong password and an unknown e-mail with the same 401', async () => {
    const world = await makeWorld(api.ds);
    const wrong = await request(api.app)
      .post('/api/auth/login')
      .send({ email: world.qa.email, password: 'not-the-password' });
    const unknown = await request(api.app)
      .post('/api/auth/login')
      .send({ email: 'nobody@factory.example', password: 'whatever-1234' });
    for (const res of [wrong, unknown]) {
      expect(res.status).toBe(401);
      expect(res.body).toEqual({
        error: { code: 'unauthenticated', message: 'E-mail or password is wrong' },
      });
      expect(res.headers['set-cookie']).toBeUndefined();
    }
  });

  it('refuses a deactivated account and an invitation not yet accepted', async () => {
    const world = await makeWorld(api.ds);
    const gone = await makeUser(api.ds, world.org, { role: 'foreman', shops: [world.shopA], active: false });
    const invited = await makeUser(api.ds, world.org, {
      role: 'foreman',
      shops: [world.shopA],
      invited: true,
    });
    for (const u of [gone, invited]) {
      const res = await request(api.app)
        .post('/api/auth/login')
        .send({ email: u.email, password: TEST_PASSWORD });
      expect(res.status).toBe(401);
    }
  });

  it('rate-limits repeated failures for one address and e-mail with 429, other e-mails unaffected', async () => {
    const world = await makeWorld(api.ds);
    for (let i = 0; i < 3; i++) {
      const res = await request(api.app)
        .post('/api/auth/login')
        .send({ email: world.foreman.email, password: 'wrong-password' });
      expect(res.status).toBe(401);
    }
    const limited = await request(api.app)
      .post('/api/auth/login')
      .send({ email: world.foreman.email, password: TEST_PASSWORD });
    expect(limited.status).toBe(429);
    expect(errorOf(limited).code).toBe('rate_limited');
    const other = await request(api.app)
      .post('/api/auth/login')
      .send({ email: world.qa.email, password: TEST_PASSWORD });
    expect(other.status).toBe(200);
  });

  it('gives 400 with field names for a malformed body', async () => {
    const res = await request(api.app).post('/api/auth/login').send({ email: 'not-an-address' });
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields ?? {}).sort()).toEqual(['email', 'password']);
  });
});

describe('GET /api/me and sign-out', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('is 401 without a session and with a forged one', async () => {
    expect((await request(api.app).get('/api/me')).status).toBe(401);
    const forged = await request(api.app)
      .get('/api/me')
      .set('Cookie', 'beadroll_session=eyJhbGciOiJIUzI1NiJ9.e30.bad');
    expect(forged.status).toBe(401);
    expect(errorOf(forged).code).toBe('unauthenticated');
  });

  it('describes a QA manager: every shop of the company', async () => {
    const world = await makeWorld(api.ds);
    const me = meSchema.parse(
      (await (await signIn(api.app, world.qa.email, TEST_PASSWORD)).get('/api/me').expect(200)).body,
    );
    expect(me).toMatchObject({
      id: world.qa.id,
      role: 'qa_manager',
      welderId: null,
      organization: { id: world.org.id, name: world.org.name },
    });
    expect(me.shops.map((s) => s.code)).toEqual(['AA', 'BB']);
  });

  it('describes a foreman: assigned shops only', async () => {
    const world = await makeWorld(api.ds);
    const me = meSchema.parse(
      (await (await signIn(api.app, world.foreman.email, TEST_PASSWORD)).get('/api/me').expect(200)).body,
    );
    expect(me.role).toBe('foreman');
    expect(me.shops).toEqual([{ id: world.shopA.id, name: world.shopA.name, code: 'AA' }]);
  });

  it('describes a welder: the home shop and the welder record', async () => {
    const world = await makeWorld(api.ds);
    const me = meSchema.parse(
      (await (await signIn(api.app, world.welder.email, TEST_PASSWORD)).get('/api/me').expect(200)).body,
    );
    expect(me).toMatchObject({ role: 'welder', welderId: world.weldersA[0]!.id });
    expect(me.shops.map((s) => s.code)).toEqual(['AA']);
  });

  it('signs out: 204, cookie cleared, /api/me 401 afterwards', async () => {
    const world = await makeWorld(api.ds);
    const agent = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const out = await agent.post('/api/auth/logout');
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(/beadroll_session=;/);
    expect((await agent.get('/api/me')).status).toBe(401);
  });

  it('ends the session of an account deactivated after sign-in', async () => {
    const world = await makeWorld(api.ds);
    const agent = await signIn(api.app, world.foreman.email, TEST_PASSWORD);
    await api.ds.query(`UPDATE users SET active = false WHERE id = $1`, [world.foreman.id]);
    expect((await agent.get('/api/me')).status).toBe(401);
  });
});
