import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { z } from 'zod';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD, uniqueEmail } from '../../support/factories.js';
import { waitForMail } from '../../support/mail.js';

const summary = z.object({
  id: z.string(),
  date: z.string(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
});
const list = z.object({ items: z.array(summary) });
const detail = summary.extend({ text: z.string(), html: z.string() });

describe('/api/dev/mail (development tool)', () => {
  let api: TestApi;
  let production: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
    production = await startTestApi({ config: { nodeEnv: 'production', isProduction: true } });
  });
  afterAll(async () => {
    await api.close();
    await production.close();
  });

  it('lists what the mail catcher received, newest first, and shows one message', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const email = uniqueEmail('dev-mail');
    await qa.post('/api/people').send({ email, name: 'Dev Mailer', role: 'qa_manager' }).expect(201);
    await waitForMail(api.config.mailDir, email);

    const { items } = bodyOf(list, await qa.get('/api/dev/mail').expect(200));
    const mine = items.find((m) => m.to.includes(email));
    expect(mine).toBeDefined();
    const dates = items.map((m) => m.date);
    expect([...dates].sort().reverse()).toEqual(dates);

    const one = bodyOf(detail, await qa.get(`/api/dev/mail/${mine!.id}`).expect(200));
    expect(one.text).toContain('/set-password?token=');
    expect(one.html).toContain('Dev Mailer');
    expect(one.from).toContain('no-reply@beadroll.example');
  });

  it('answers 404 for unknown or path-like ids', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.get('/api/dev/mail/nope-0000')).status).toBe(404);
    expect((await qa.get('/api/dev/mail/..%2F..%2Fetc%2Fpasswd')).status).toBe(404);
  });

  it('does not exist in production', async () => {
    expect((await request(production.app).get('/api/dev/mail')).status).toBe(404);
  });
});
