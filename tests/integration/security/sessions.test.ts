// Finding 1: sessions end. Signing out ends the session the cookie names (a replayed cookie is refused);
// a password reset, a deactivation or a role change ends every session of the account; the owner lists
// their sessions and ends the others.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { sessionListSchema } from '@beadroll/rules';
import { bodyOf, movableClock, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { linkToken, waitForMail } from '../../support/mail.js';

async function cookieOf(api: TestApi, email: string, userAgent = 'test-browser'): Promise<string> {
  const res = await request(api.app)
    .post('/api/auth/login')
    .set('User-Agent', userAgent)
    .send({ email, password: TEST_PASSWORD });
  expect(res.status).toBe(200);
  return String(res.headers['set-cookie']).split(';')[0]!;
}

const meWith = (api: TestApi, cookie: string) => request(api.app).get('/api/me').set('Cookie', cookie);

describe('sessions that end', () => {
  let api: TestApi;
  const clock = movableClock();
  beforeAll(async () => {
    api = await startTestApi({ clock });
  });
  afterAll(() => api.close());

  it('refuses the cookie of a signed-out session when it is sent again', async () => {
    const world = await makeWorld(api.ds);
    const cookie = await cookieOf(api, world.qa.email);
    expect((await meWith(api, cookie)).status).toBe(200);
    const out = await request(api.app).post('/api/auth/logout').set('Cookie', cookie);
    expect(out.status).toBe(204);
    expect((await meWith(api, cookie)).status).toBe(401);
  });

  it('ends every session of the account when its password is reset by link', async () => {
    const world = await makeWorld(api.ds);
    const first = await cookieOf(api, world.foreman.email, 'phone');
    const second = await cookieOf(api, world.foreman.email, 'desk');
    const asked = await request(api.app).post('/api/auth/password-reset').send({ email: world.foreman.email });
    expect(asked.status).toBe(202);
    const token = linkToken(await waitForMail(api.config.mailDir, world.foreman.email));
    const set = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token, password: 'a-fresh-password-77' });
    expect(set.status).toBe(200);
    expect((await meWith(api, first)).status).toBe(401);
    expect((await meWith(api, second)).status).toBe(401);
    const fresh = String(set.headers['set-cookie']).split(';')[0]!;
    expect((await meWith(api, fresh)).status).toBe(200);
  });

  it('ends every session on deactivation (and reactivation does not bring them back) and on a role change', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const foreman = await cookieOf(api, world.foreman.email);
    expect((await qa.patch(`/api/people/${world.foreman.id}`).send({ active: false })).status).toBe(200);
    expect((await qa.patch(`/api/people/${world.foreman.id}`).send({ active: true })).status).toBe(200);
    expect((await meWith(api, foreman)).status).toBe(401);

    const qaCookie = await cookieOf(api, world.qa.email);
    await api.ds.query(`UPDATE users SET role = 'foreman' WHERE id = $1`, [world.qa.id]);
    expect((await meWith(api, qaCookie)).status).toBe(401);
    const [row] = await api.ds.query<{ ended_reason: string }[]>(
      `SELECT ended_reason FROM sessions WHERE user_id = $1 ORDER BY created_at DESC LIMIT 1`,
      [world.qa.id],
    );
    expect(row?.ended_reason).toBe('role');
  });

  it('lists the owner’s sessions and ends one or all the others, never another person’s', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    const phone = await cookieOf(api, world.welder.email, 'Phone browser');
    const desk = await cookieOf(api, world.welder.email, 'Desk browser');
    const tablet = await cookieOf(api, world.welder.email, 'Tablet browser');
    const list = bodyOf(sessionListSchema, await request(api.app).get('/api/auth/sessions').set('Cookie', desk));
    expect(list.items).toHaveLength(3);
    expect(list.items.filter((s) => s.current).map((s) => s.userAgent)).toEqual(['Desk browser']);
    const phoneId = list.items.find((s) => s.userAgent === 'Phone browser')!.id;

    // Another company's QA manager cannot end it: 404, and it still works.
    const foreign = await cookieOf(api, other.qa.email);
    expect((await request(api.app).delete(`/api/auth/sessions/${phoneId}`).set('Cookie', foreign)).status).toBe(404);
    expect((await meWith(api, phone)).status).toBe(200);

    expect((await request(api.app).delete(`/api/auth/sessions/${phoneId}`).set('Cookie', desk)).status).toBe(204);
    expect((await meWith(api, phone)).status).toBe(401);
    expect((await meWith(api, tablet)).status).toBe(200);

    const ended = await request(api.app).post('/api/auth/sessions/end-others').set('Cookie', desk);
    expect(ended.body).toEqual({ ended: 1 });
    expect((await meWith(api, tablet)).status).toBe(401);
    expect((await meWith(api, desk)).status).toBe(200);
    const audit = await api.ds.query<{ action: string }[]>(
      `SELECT action FROM audit_events WHERE entity_id = $1`,
      [world.welder.id],
    );
    expect(audit.map((a) => a.action)).toEqual(['person.sessions_ended', 'person.sessions_ended']);
  });

  it('refuses a correctly signed token that names no session, and a session past its 12 hours', async () => {
    const world = await makeWorld(api.ds);
    const forged = jwt.sign({ org: world.org.id }, api.config.jwtSecret, {
      subject: world.qa.id,
      issuer: 'beadroll',
      algorithm: 'HS256',
      expiresIn: '1h',
    });
    expect((await meWith(api, `beadroll_session=${forged}`)).status).toBe(401);
    const cookie = await cookieOf(api, world.qa.email);
    clock.advance(12 * 3600 * 1000 + 1000);
    try {
      // The JWT itself is checked against real time; the session row against the app's clock.
      expect((await meWith(api, cookie)).status).toBe(401);
    } finally {
      clock.advance(-(12 * 3600 * 1000 + 1000));
    }
  });
});
