// How the web app's files travel: the build's brotli and gzip copies sent as they are, hashed assets
// cached for good, the HTML shell revalidated every time, JSON compressed per response.
import { mkdtemp, mkdir, writeFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { brotliCompressSync, gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { signIn, startTestApi, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

const script = `console.log(${JSON.stringify('beadroll '.repeat(200))});`;

describe('serving the web app', () => {
  let api: TestApi;
  let webDir: string;
  beforeAll(async () => {
    webDir = await mkdtemp(path.join(tmpdir(), 'beadroll-web-'));
    await mkdir(path.join(webDir, 'assets'));
    await writeFile(path.join(webDir, 'index.html'), '<!doctype html><title>Beadroll</title><div id="root"></div>');
    const file = path.join(webDir, 'assets', 'app-5678.js');
    await writeFile(file, script);
    // Marked copies, so the test sees which file was sent.
    await writeFile(`${file}.br`, brotliCompressSync(Buffer.from(`${script}//br`)));
    await writeFile(`${file}.gz`, gzipSync(Buffer.from(`${script}//gz`)));
    api = await startTestApi({ webDist: webDir });
  });
  afterAll(async () => {
    await api.close();
    await rm(webDir, { recursive: true, force: true });
  });

  it('sends the prebuilt brotli copy of a hashed asset to a browser that accepts it, cached for good', async () => {
    const res = await request(api.app).get('/assets/app-5678.js').set('Accept-Encoding', 'gzip, deflate, br');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(res.headers['content-type']).toMatch(/javascript/);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(res.headers['vary']).toMatch(/Accept-Encoding/i);
    expect(res.text.endsWith('//br')).toBe(true);
  });

  it('sends the gzip copy when brotli is not accepted, and the plain file when nothing is', async () => {
    const gz = await request(api.app).get('/assets/app-5678.js').set('Accept-Encoding', 'gzip');
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.text.endsWith('//gz')).toBe(true);
    const plain = await request(api.app).get('/assets/app-5678.js').set('Accept-Encoding', 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.text).toBe(script);
  });

  it('never caches the HTML shell, on a deep link or at /', async () => {
    for (const url of ['/', '/welders/1234', '/verify/abc']) {
      const res = await request(api.app).get(url);
      expect(res.status).toBe(200);
      expect(res.headers['cache-control']).toBe('no-cache');
    }
  });

  it('answers a missing asset with 404 instead of the HTML shell', async () => {
    const res = await request(api.app).get('/assets/app-0000.js');
    expect(res.status).toBe(404);
    expect(res.text).not.toContain('<div id="root">');
  });

  it('compresses JSON answers for a client that accepts gzip', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    for (let i = 0; i < 30; i++) await qa.post('/api/shops').send({ name: `Compression bay ${i}`, code: `CB${i}` });
    const res = await qa.get('/api/shops').set('Accept-Encoding', 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.headers['cache-control']).toBe('no-store');
  });
});
