// Finding 5: development mode is not wide open. The mail catcher's inbox (password-reset links) is
// readable only on this machine, and only by a signed-in person, for their own company's mail (or by
// anyone on this machine behind the explicit DEV_MAIL_OPEN flag); the object store answers only requests
// signed with the data folder's own key pair.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { z } from 'zod';
import { createStorage } from '../../../apps/api/src/lib/storage.js';
import { signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { makeOtherCompany, makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { waitForMail } from '../../support/mail.js';

const list = z.object({ items: z.array(z.object({ id: z.string(), to: z.string(), subject: z.string() })) });

describe('development mail', () => {
  let api: TestApi;
  let open: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
    open = await startTestApi({ config: { devMailOpen: true } });
  });
  afterAll(async () => {
    await api.close();
    await open.close();
  });

  it('shows a signed-in person only their own company’s mail; signed out 401; through a proxy 404', async () => {
    const world = await makeWorld(api.ds);
    const other = await makeOtherCompany(api.ds);
    await request(api.app).post('/api/auth/password-reset').send({ email: world.foreman.email }).expect(202);
    await request(api.app).post('/api/auth/password-reset').send({ email: other.qa.email }).expect(202);
    await waitForMail(api.config.mailDir, world.foreman.email);
    await waitForMail(api.config.mailDir, other.qa.email);

    expect((await request(api.app).get('/api/dev/mail')).status).toBe(401);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await qa.get('/api/dev/mail').set('X-Forwarded-For', '203.0.113.9')).status).toBe(404);

    const mine = list.parse((await qa.get('/api/dev/mail').expect(200)).body).items;
    expect(mine.some((m) => m.to.includes(world.foreman.email))).toBe(true);
    expect(mine.some((m) => m.to.includes(other.qa.email))).toBe(false);

    const theirs = list.parse((await signIn(open.app, other.qa.email, TEST_PASSWORD).then((a) => a.get('/api/dev/mail'))).body).items;
    const foreign = theirs.find((m) => m.to.includes(other.qa.email))!;
    expect((await qa.get(`/api/dev/mail/${foreign.id}`)).status).toBe(404);
  });

  it('shows everything to anyone on this machine only behind DEV_MAIL_OPEN', async () => {
    const res = await request(open.app).get('/api/dev/mail').expect(200);
    expect(list.parse(res.body).items.length).toBeGreaterThan(0);
    expect((await request(open.app).get('/api/dev/mail').set('X-Forwarded-For', '203.0.113.9')).status).toBe(404);
  });
});

describe('the local object store', () => {
  it('refuses unsigned requests and requests signed with any other key pair', async () => {
    const config = testConfig();
    const storage = createStorage(config.s3);
    const key = `tests/${randomUUID()}/secret.pdf`;
    await storage.put(key, Buffer.from('%PDF-1.4 company file'), 'application/pdf');
    try {
      const anonymous = await fetch(`${config.s3.endpoint}/${config.s3.bucket}/${key}`);
      expect(anonymous.status).toBe(403);
      const listing = await fetch(`${config.s3.endpoint}/${config.s3.bucket}`);
      expect(listing.status).toBe(403);
      for (const creds of [
        { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
        { accessKeyId: config.s3.accessKeyId, secretAccessKey: 'not-the-secret' },
      ]) {
        const intruder = createStorage({ ...config.s3, ...creds });
        await expect(intruder.get(key)).rejects.toThrow();
        intruder.close();
      }
      expect((await storage.get(key)).body.toString()).toBe('%PDF-1.4 company file');
    } finally {
      await storage.delete(key);
      storage.close();
    }
  });
});
