import { mkdtemp, mkdir, writeFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { errorBodySchema } from '@beadroll/rules';
import { errorOf, signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

describe('HTTP behaviour common to every route', () => {
  let api: TestApi;
  let webDir: string;
  beforeAll(async () => {
    webDir = await mkdtemp(path.join(tmpdir(), 'beadroll-web-'));
    await mkdir(path.join(webDir, 'assets'));
    await writeFile(
      path.join(webDir, 'index.html'),
      '<!doctype html><title>Beadroll</title><div id="root"></div>',
    );
    await writeFile(path.join(webDir, 'assets', 'app-1234.js'), 'console.log("beadroll")');
    api = await startTestApi({ webDist: webDir });
  });
  afterAll(async () => {
    await api.close();
    await rm(webDir, { recursive: true, force: true });
  });

  it('answers an unknown API route with a JSON 404', async () => {
    const res = await request(api.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/json/);
    expect(errorBodySchema.parse(res.body).error.code).toBe('not_found');
  });

  it('answers malformed JSON with 400, not 500', async () => {
    const res = await request(api.app)
      .post('/api/auth/login')
      .set('Content-Type', 'application/json')
      .send('{"email": "x@y.example",');
    expect(res.status).toBe(400);
    expect(errorOf(res).code).toBe('validation');
    expect(JSON.stringify(res.body)).not.toMatch(/SyntaxError|at JSON\.parse/);
  });

  it('refuses a body over 100 kb with 413', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa.post('/api/shops').send({ name: 'x'.repeat(150 * 1024), code: 'BIG' });
    expect(res.status).toBe(413);
    expect(errorOf(res).code).toBe('payload_too_large');
    const rows: unknown[] = await api.ds.query(
      `SELECT 1 FROM shops WHERE organization_id = $1 AND code = 'BIG'`,
      [world.org.id],
    );
    expect(rows).toHaveLength(0);
  });

  it('names every offending field of a bad body with its dotted path', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    const res = await qa
      .post('/api/people')
      .send({ email: 'not-an-email', name: '', role: 'foreman', shopIds: ['nope'] });
    expect(res.status).toBe(400);
    expect(Object.keys(errorOf(res).fields as object).sort()).toEqual(['email', 'name', 'shopIds.0']);
  });

  it('sets security headers and a request id, and no x-powered-by', async () => {
    const res = await request(api.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-request-id']).toMatch(/^[\w.-]+$/);
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('serves the web app with the SPA fallback for deep links, but never for /api', async () => {
    const deep = await request(api.app).get('/welders/1234');
    expect(deep.status).toBe(200);
    expect(deep.text).toContain('<div id="root">');
    const asset = await request(api.app).get('/assets/app-1234.js');
    expect(asset.status).toBe(200);
    expect(asset.headers['cache-control']).toContain('immutable');
    const api404 = await request(api.app).get('/api/welders-typo');
    expect(api404.status).toBe(404);
    expect(errorOf(api404).code).toBe('not_found');
  });
});
