// Finding 2: forged requests. A state-changing request from another site's page is refused with 403
// before anything runs — whatever its body (none, multipart, JSON); the app's own pages and programs
// without browser headers go through; an API token (Authorization header) is exempt. And GET never
// writes (the card/WPQ download half is in qualifications.test.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { apiTokenCreatedSchema } from '@beadroll/rules';
import { bodyOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const EVIL = 'https://evil.example';
const PNG = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
  'base64',
);

describe('cross-site requests', () => {
  let api: TestApi;
  let world: Awaited<ReturnType<typeof makeWorld>>;
  let qa: Awaited<ReturnType<typeof signIn>>;
  let appOrigin: string;
  beforeAll(async () => {
    api = await startTestApi();
    appOrigin = new URL(api.config.appUrl).origin;
    world = await makeWorld(api.ds);
    qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
  });
  afterAll(() => api.close());

  const rows = async (sql: string, params: unknown[]) => (await api.ds.query<unknown[]>(sql, params)).length;

  it('refuses, from a foreign Origin, the body-less and multipart requests the probe ran: 403 and nothing written', async () => {
    const welderId = world.weldersA[0]!.id;
    const invited = (
      await qa.post('/api/people').send({ email: `csrf-${Date.now()}@factory.example`, name: 'Ivy Invite', role: 'qa_manager' })
    ).body as { id: string };
    const auditBefore = await rows(`SELECT 1 FROM audit_events WHERE organization_id = $1`, [world.org.id]);
    const uploadsBefore = await rows(`SELECT 1 FROM uploads WHERE organization_id = $1`, [world.org.id]);
    const forged = [
      qa.post(`/api/welders/${welderId}/verify-token`).set('Origin', EVIL),
      qa.post(`/api/people/${invited.id}/invitation`).set('Origin', EVIL),
      qa.post('/api/uploads').set('Origin', EVIL).field('kind', 'other').attach('file', PNG, 'x.png'),
      qa.post('/api/lapse-watch/runs').set('Origin', EVIL),
      qa.post(`/api/continuity/entries/${welderId}/review`).set('Origin', EVIL),
      qa.post('/api/shops').set('Origin', 'null').send({ name: 'Forged', code: 'FG' }),
      qa.post('/api/auth/logout').set('Sec-Fetch-Site', 'cross-site'),
      qa.delete(`/api/welders/${welderId}/verify-token`).set('Sec-Fetch-Site', 'same-site'),
    ];
    for (const [i, res] of (await Promise.all(forged)).entries()) {
      expect(res.status, `forged request #${i}`).toBe(403);
      expect((res.body as { error: { code: string } }).error.code).toBe('forbidden');
    }
    expect(await rows(`SELECT 1 FROM audit_events WHERE organization_id = $1`, [world.org.id])).toBe(auditBefore);
    expect(await rows(`SELECT 1 FROM uploads WHERE organization_id = $1`, [world.org.id])).toBe(uploadsBefore);
    expect(await rows(`SELECT 1 FROM verify_tokens WHERE welder_id = $1`, [welderId])).toBe(0);
    // The session survived the forged sign-out.
    expect((await qa.get('/api/me')).status).toBe(200);
  });

  it('lets the app’s own pages through (Origin = APP_URL or the Host it was sent to, Sec-Fetch-Site same-origin)', async () => {
    const welderId = world.weldersB[0]!.id;
    await qa.post(`/api/welders/${welderId}/verify-token`).set('Origin', appOrigin).expect(201);
    await qa.post(`/api/welders/${welderId}/verify-token`).set('Sec-Fetch-Site', 'same-origin').expect(201);
    const res = await qa.post('/api/shops').set('Host', 'beadroll.shop.example').set('Origin', 'http://beadroll.shop.example').send({ name: 'Own Page', code: 'OP' });
    expect(res.status).toBe(201);
  });

  it('exempts a request that carries an API token, whatever its Origin', async () => {
    const created = bodyOf(apiTokenCreatedSchema, await qa.post('/api/api-tokens').send({ name: 'csrf', access: 'read-write' }).expect(201));
    const res = await request(api.app)
      .post('/api/shops')
      .set('Origin', EVIL)
      .set('Authorization', `Bearer ${created.token}`)
      .send({ name: 'By Token', code: 'TK' });
    expect(res.status).not.toBe(403);
    expect(res.status).toBeLessThan(500);
  });

  it('reads are never refused for their Origin', async () => {
    expect((await qa.get('/api/me').set('Origin', EVIL)).status).toBe(200);
  });
});
