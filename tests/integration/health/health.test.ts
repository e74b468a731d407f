import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createDataSource } from '../../../apps/api/src/db/data-source.js';
import { errorOf, signIn, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { startTcpProxy, type TcpProxy } from '../../support/api-tcp-proxy.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';

describe('GET /api/health', () => {
  let api: TestApi;
  beforeAll(async () => {
    api = await startTestApi();
  });
  afterAll(() => api.close());

  it('answers 200 with the database ok', async () => {
    const res = await request(api.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok' });
  });
});

describe('losing the database and getting it back', () => {
  let proxy: TcpProxy;
  let api: TestApi;
  beforeAll(async () => {
    const config = testConfig();
    proxy = await startTcpProxy({ host: config.db.host, port: config.db.port });
    api = await startTestApi({
      dataSource: createDataSource({ ...config.db, port: proxy.port }, { poolSize: 2 }),
    });
  });
  afterAll(async () => {
    await api.close();
    await proxy.cut();
  });

  it('goes 200 → 503 while PostgreSQL is away → 200 again, without a restart', async () => {
    const world = await makeWorld(api.ds);
    const qa = await signIn(api.app, world.qa.email, TEST_PASSWORD);
    expect((await request(api.app).get('/api/health')).status).toBe(200);

    await proxy.cut();
    const down = await request(api.app).get('/api/health');
    expect(down.status).toBe(503);
    expect(down.body).toEqual({ status: 'degraded', db: 'down' });
    // Other routes say so too, as JSON and without a stack trace.
    const list = await qa.get('/api/welders');
    expect(list.status).toBe(503);
    expect(errorOf(list).code).toBe('unavailable');
    expect(JSON.stringify(list.body)).not.toMatch(/at .*\.ts:\d+/);

    await proxy.restore();
    const up = await request(api.app).get('/api/health');
    expect(up.status).toBe(200);
    expect(up.body).toEqual({ status: 'ok', db: 'ok' });
    expect((await qa.get('/api/welders')).status).toBe(200);
  });
});
