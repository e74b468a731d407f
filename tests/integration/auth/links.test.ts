import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { z } from 'zod';
import { meSchema, personSchema, tokenInfoSchema } from '@beadroll/rules';
import { sendDueLinkMails } from '../../../apps/api/src/auth/link-mail.js';
import { startMailCatcher } from '../../../docker-free-scripts/mail-catcher.js';
import {
  bodyOf,
  errorOf,
  movableClock,
  signIn,
  startTestApi,
  testConfig,
  type TestApi,
} from '../../support/api-app.js';
import { makeUser, makeWorld, TEST_PASSWORD, uniqueEmail } from '../../support/factories.js';
import { linkToken, mailsTo, waitForMail } from '../../support/mail.js';

const personList = z.object({ items: z.array(personSchema) });
const NEW_PASSWORD = 'brand-new-password-42';
const EXPIRED = 'This link has expired or was already used';

describe('invitation e-mail → set password → signed in', () => {
  let api: TestApi;
  const clock = movableClock();
  beforeAll(async () => {
    api = await startTestApi({ clock });
  });
  afterAll(() => api.close());

  it('delivers the invitation to the mail catcher; its link sets the password and signs the person in', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('new-foreman');
    const created = await qa
      .post('/api/people')
      .send({ email, name: 'Nell Foreman', role: 'foreman', shopIds: [world.shopB.id] });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ email, status: 'invited', shops: [{ id: world.shopB.id }] });

    const mail = await waitForMail(api.config.mailDir, email);
    expect(mail.subject).toContain(world.org.name);
    expect(mail.text).toContain(`${api.config.appUrl}/set-password?token=`);
    expect(mail.html).toContain('/set-password?token=');
    const token = linkToken(mail);

    const info = await request(api.app).get(`/api/auth/tokens/${token}`);
    expect(info.status).toBe(200);
    expect(tokenInfoSchema.parse(info.body)).toMatchObject({
      email,
      name: 'Nell Foreman',
      purpose: 'invitation',
    });

    const agent = request.agent(api.app);
    const set = await agent.post('/api/auth/set-password').send({ token, password: NEW_PASSWORD });
    expect(set.status).toBe(200);
    expect(meSchema.parse(set.body)).toMatchObject({ email, role: 'foreman' });
    expect(String(set.headers['set-cookie'])).toMatch(/beadroll_session=/);
    expect(bodyOf(meSchema, await agent.get('/api/me')).email).toBe(email);

    // Single use; and the new password works for an ordinary sign-in.
    const again = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token, password: 'another-password-99' });
    expect(again.status).toBe(400);
    expect(errorOf(again).fields).toEqual({ token: EXPIRED });
    expect(
      (await request(api.app).post('/api/auth/login').send({ email, password: NEW_PASSWORD })).status,
    ).toBe(200);
    const people = await qa.get('/api/people');
    expect(bodyOf(personList, people).items.find((p) => p.email === email)?.status).toBe('active');
  });

  it('refuses an invitation link older than 7 days', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('late');
    await qa.post('/api/people').send({ email, name: 'Late Larkin', role: 'qa_manager' }).expect(201);
    const token = linkToken(await waitForMail(api.config.mailDir, email));
    clock.advance(7 * 24 * 3600 * 1000 + 60_000);
    try {
      // An unusable link is an answer, not an error status: the page says why and the browser logs nothing.
      const info = await request(api.app).get(`/api/auth/tokens/${token}`);
      expect(info.status).toBe(200);
      expect(tokenInfoSchema.parse(info.body)).toEqual({ usable: false, message: EXPIRED });
      const set = await request(api.app)
        .post('/api/auth/set-password')
        .send({ token, password: NEW_PASSWORD });
      expect(set.status).toBe(400);
      const [row] = await api.ds.query<{ password_hash: string | null }[]>(
        `SELECT password_hash FROM users WHERE email = $1`,
        [email],
      );
      expect(row?.password_hash).toBeNull();
    } finally {
      clock.advance(-(7 * 24 * 3600 * 1000 + 60_000));
    }
  });

  it('re-sends a fresh invitation and voids the old link', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('resend');
    const personId = bodyOf(
      personSchema,
      await qa.post('/api/people').send({ email, name: 'Rhys Resend', role: 'qa_manager' }).expect(201),
    ).id;
    const first = linkToken(await waitForMail(api.config.mailDir, email));
    expect((await qa.post(`/api/people/${personId}/invitation`)).status).toBe(202);
    const second = linkToken(await waitForMail(api.config.mailDir, email, { count: 2 }));
    expect(second).not.toBe(first);
    expect(bodyOf(tokenInfoSchema, await request(api.app).get(`/api/auth/tokens/${first}`)).usable).toBe(false);
    expect(bodyOf(tokenInfoSchema, await request(api.app).get(`/api/auth/tokens/${second}`)).usable).toBe(true);
    // Once the password is set there is nothing to re-send.
    await request(api.app)
      .post('/api/auth/set-password')
      .send({ token: second, password: NEW_PASSWORD })
      .expect(200);
    expect((await qa.post(`/api/people/${personId}/invitation`)).status).toBe(409);
  });

  it('answers made-up and malformed tokens as unusable links, and refuses them on use with 400', async () => {
    for (const token of ['short', 'x'.repeat(43)]) {
      const res = await request(api.app).get(`/api/auth/tokens/${token}`);
      expect(res.status).toBe(200);
      expect(tokenInfoSchema.parse(res.body)).toEqual({ usable: false, message: EXPIRED });
    }
    const weak = await request(api.app)
      .post('/api/auth/set-password')
      .send({ token: 'x'.repeat(43), password: 'short' });
    expect(weak.status).toBe(400);
    expect(Object.keys(errorOf(weak).fields as object)).toEqual(['password']);
  });
});

describe('password reset by e-mail', () => {
  let api: TestApi;
  const clock = movableClock();
  beforeAll(async () => {
    api = await startTestApi({ clock });
  });
  afterAll(() => api.close());

  it('mails a reset link; it replaces the password and signs in; the old password stops working', async () => {
    const world = await makeWorld(api.ds);
    const res = await request(api.app).post('/api/auth/password-reset').send({ email: world.foreman.email });
    expect(res.status).toBe(202);
    const mail = await waitForMail(api.config.mailDir, world.foreman.email);
    expect(mail.subject).toMatch(/reset/i);
    const token = linkToken(mail);
    expect(bodyOf(tokenInfoSchema, await request(api.app).get(`/api/auth/tokens/${token}`))).toMatchObject({
      usable: true,
      purpose: 'password-reset',
    });
    const set = await request(api.app).post('/api/auth/set-password').send({ token, password: NEW_PASSWORD });
    expect(set.status).toBe(200);
    expect(bodyOf(meSchema, set).id).toBe(world.foreman.id);
    expect(
      (
        await request(api.app)
          .post('/api/auth/login')
          .send({ email: world.foreman.email, password: TEST_PASSWORD })
      ).status,
    ).toBe(401);
    expect(
      (
        await request(api.app)
          .post('/api/auth/login')
          .send({ email: world.foreman.email, password: NEW_PASSWORD })
      ).status,
    ).toBe(200);
  });

  it('answers 202 for an unknown e-mail too, and sends nothing', async () => {
    const nobody = uniqueEmail('nobody');
    const res = await request(api.app).post('/api/auth/password-reset').send({ email: nobody });
    expect(res.status).toBe(202);
    // A message to a known address sent afterwards arrives; none for the unknown one by then.
    const world = await makeWorld(api.ds);
    await request(api.app).post('/api/auth/password-reset').send({ email: world.qa.email }).expect(202);
    await waitForMail(api.config.mailDir, world.qa.email);
    expect(await mailsTo(api.config.mailDir, nobody)).toHaveLength(0);
  });

  it('expires a reset link after one hour', async () => {
    const world = await makeWorld(api.ds);
    await request(api.app).post('/api/auth/password-reset').send({ email: world.welder.email }).expect(202);
    const token = linkToken(await waitForMail(api.config.mailDir, world.welder.email));
    clock.advance(61 * 60 * 1000);
    try {
      expect(
        (await request(api.app).post('/api/auth/set-password').send({ token, password: NEW_PASSWORD }))
          .status,
      ).toBe(400);
    } finally {
      clock.advance(-61 * 60 * 1000);
    }
  });

  it('sends no link for a deactivated account', async () => {
    const world = await makeWorld(api.ds);
    const gone = await makeUser(api.ds, world.org, { role: 'qa_manager', active: false });
    await request(api.app).post('/api/auth/password-reset').send({ email: gone.email }).expect(202);
    await request(api.app).post('/api/auth/password-reset').send({ email: world.qa.email }).expect(202);
    await waitForMail(api.config.mailDir, world.qa.email);
    expect(await mailsTo(api.config.mailDir, gone.email)).toHaveLength(0);
  });
});

describe('when the mail server is down', () => {
  const freePort = () =>
    new Promise<number>((resolve) => {
      const s = net.createServer().listen(0, '127.0.0.1', () => {
        const { port } = s.address() as net.AddressInfo;
        s.close(() => resolve(port));
      });
    });

  let api: TestApi;
  let dir: string;
  let port: number;
  beforeAll(async () => {
    dir = await mkdtemp(path.join(tmpdir(), 'beadroll-mail-'));
    port = await freePort();
    const base = testConfig();
    api = await startTestApi({ config: { smtp: { ...base.smtp, port }, mailDir: dir } });
  });
  afterAll(async () => {
    await api.close();
    await rm(dir, { recursive: true, force: true });
  });

  it('keeps an invitation it cannot send yet (201, in the outbox), and sends it once the catcher is back', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('unsent');
    const res = await qa.post('/api/people').send({ email, name: 'Una Sent', role: 'qa_manager' });
    expect(res.status).toBe(201);
    const outbox = async () =>
      (
        await api.ds.query<{ status: string; attempts: number }[]>(
          `SELECT m.status, m.attempts FROM link_mails m JOIN users u ON u.id = m.user_id WHERE u.email = $1`,
          [email],
        )
      )[0];
    const deadline = Date.now() + 15_000;
    while ((await outbox())?.attempts !== 1 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    expect(await outbox()).toEqual({ status: 'pending', attempts: 1 });

    const catcher = await startMailCatcher({ port, dir });
    try {
      // The schedule's next try after the backoff.
      await sendDueLinkMails({ ...api.deps, clock: { now: () => new Date(Date.now() + 2 * 60_000) } }, world.org.id);
      expect(await outbox()).toEqual({ status: 'sent', attempts: 2 });
      expect(linkToken(await waitForMail(dir, email))).toMatch(/^[\w-]{40,}$/);
    } finally {
      await catcher.close();
    }
  });
});
