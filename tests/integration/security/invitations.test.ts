// Finding 7 (issue 11): inviting an address that already signs in for another company must neither tell
// the inviter so ("already has an account") nor let the invitation take that account over. The inviter
// gets the same answer as for any new address, in the same time: no request waits on the mail relay, the
// invitation e-mail leaves through the link-mail outbox after the response. The address's owner is told,
// on using the link, that the address already signs in elsewhere; the existing account, its password and
// sessions stay as they were.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { personSchema } from '@beadroll/rules';
import { bodyOf, errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { createMailer, type Mail } from '../../../apps/api/src/lib/mailer.js';
import { sendDueLinkMails } from '../../../apps/api/src/auth/link-mail.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD, uniqueEmail } from '../../support/factories.js';
import { linkToken, mailsTo, waitForMail } from '../../support/mail.js';

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

  it('answers both invitations before any e-mail is sent, then mails each through the outbox', async () => {
    // A relay that holds every message until the test lets it go: a request that sent mail inside itself
    // would not answer while it is held.
    const base = await startTestApi();
    const relay = createMailer(base.config.smtp);
    await base.close();
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    const sent: string[] = [];
    const holding = await startTestApi({
      mailer: {
        async send(mail: Mail) {
          await held;
          sent.push(mail.to);
          return relay.send(mail);
        },
        close: () => relay.close(),
      },
    });
    try {
      const world = await makeWorld(holding.ds);
      const other = await makeOtherCompany(holding.ds);
      const qa = await signIn(holding.app, world.qa.email, TEST_PASSWORD);
      const invite = (email: string) => {
        const started = performance.now();
        return qa
          .post('/api/people')
          .send({ email, name: 'Held Mail', role: 'foreman', shopIds: [world.shopA.id] })
          .then((res) => ({ res, ms: performance.now() - started }));
      };
      const inTime = <T,>(p: Promise<T>) =>
        Promise.race([p, new Promise<never>((_, no) => setTimeout(() => no(new Error('the request waited on the mail relay')), 8000))]);
      const freshEmail = uniqueEmail('held');
      const fresh = await inTime(invite(freshEmail));
      const taken = await inTime(invite(other.qa.email));
      expect(fresh.res.status).toBe(201);
      expect(taken.res.status).toBe(201);
      const a = bodyOf(personSchema, fresh.res);
      const b = bodyOf(personSchema, taken.res);
      expect({ ...b, id: '', email: '', createdAt: '' }).toEqual({ ...a, id: '', email: '', createdAt: '' });
      expect(sent).toEqual([]);
      // Both are in the outbox, waiting for the relay.
      const outbox = await holding.ds.query<{ userId: string; purpose: string }[]>(
        `SELECT user_id AS "userId", purpose FROM link_mails WHERE user_id = ANY($1) ORDER BY requested_at`,
        [[a.id, b.id]],
      );
      expect(outbox).toEqual([
        { userId: a.id, purpose: 'invitation' },
        { userId: b.id, purpose: 'invitation' },
      ]);
      release();
      const mails = await Promise.all([
        waitForMail(holding.config.mailDir, freshEmail),
        waitForMail(holding.config.mailDir, other.qa.email),
      ]);
      for (const m of mails) expect(m.text).toContain(world.org.name);
      const statuses = await holding.ds.query<{ status: string }[]>(
        `SELECT status FROM link_mails WHERE user_id = ANY($1)`,
        [[a.id, b.id]],
      );
      expect(statuses.map((r) => r.status)).toEqual(['sent', 'sent']);
    } finally {
      release();
      await holding.close();
    }
  });

  it('keeps an invitation whose e-mail the relay refused, and sends it on a later try', async () => {
    const base = await startTestApi();
    const relay = createMailer(base.config.smtp);
    await base.close();
    let refuse = true;
    const flaky = await startTestApi({
      mailer: {
        async send(mail: Mail) {
          if (refuse) throw new Error('421 relay busy');
          return relay.send(mail);
        },
        close: () => relay.close(),
      },
    });
    try {
      const world = await makeWorld(flaky.ds);
      const qa = await signIn(flaky.app, world.qa.email, TEST_PASSWORD);
      const email = uniqueEmail('retry');
      const res = await qa.post('/api/people').send({ email, name: 'Retry Later', role: 'qa_manager' });
      expect(res.status).toBe(201);
      const person = bodyOf(personSchema, res);
      const row = async () =>
        (
          await flaky.ds.query<{ status: string; attempts: number; lastError: string | null }[]>(
            `SELECT status, attempts, last_error AS "lastError" FROM link_mails WHERE user_id = $1`,
            [person.id],
          )
        )[0];
      const deadline = Date.now() + 10_000;
      while ((await row())?.attempts !== 1 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
      expect(await row()).toEqual({ status: 'pending', attempts: 1, lastError: '421 relay busy' });
      // The link of the refused send was voided: nothing usable is left of it.
      const tokens = await flaky.ds.query<unknown[]>(`SELECT 1 FROM auth_tokens WHERE user_id = $1 AND used_at IS NULL`, [
        person.id,
      ]);
      expect(tokens).toHaveLength(0);
      expect(await mailsTo(flaky.config.mailDir, email)).toHaveLength(0);
      // The schedule's next try, once the backoff has passed.
      refuse = false;
      const later = { now: () => new Date(Date.now() + 2 * 60_000) };
      await sendDueLinkMails({ ...flaky.deps, clock: later }, world.org.id);
      expect(await row()).toMatchObject({ status: 'sent', attempts: 2 });
      const token = linkToken(await waitForMail(flaky.config.mailDir, email));
      await request(flaky.app).get(`/api/auth/tokens/${encodeURIComponent(token)}`).expect(200);
    } finally {
      await flaky.close();
    }
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
    expect(info.status).toBe(200);
    expect(info.body).toMatchObject({ usable: false, message: expect.stringMatching(/already signs in to Beadroll for another company/) as unknown });
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
