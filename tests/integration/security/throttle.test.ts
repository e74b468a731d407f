// Finding 6: sign-in throttling per account and per client address, kept in PostgreSQL (two app
// instances share the counts), with a growing hold instead of a fixed 15-minute lockout; a held account
// is reachable through a password reset; refused requests during an outage are not counted.
// Finding 7: a password reset answers before anything is looked up or mailed.
import { randomInt } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { movableClock, startTestApi, testConfig, type TestApi } from '../../support/api-app.js';
import { makeWorld, TEST_PASSWORD } from '../../support/factories.js';
import { linkToken, waitForMail } from '../../support/mail.js';
import { startTcpProxy } from '../../support/api-tcp-proxy.js';
import { createDataSource } from '../../../apps/api/src/db/data-source.js';
import type { Mailer } from '../../../apps/api/src/lib/mailer.js';
import { createMailer } from '../../../apps/api/src/lib/mailer.js';

// Each test signs in from an address of its own (documentation range), told through X-Forwarded-For
// to apps that trust the loopback proxy, so counts never spill over into other test files.
// Drawn without repeats within this file, so one test's held address never meets another test's sign-ins.
const unusedAddresses = Array.from({ length: 254 }, (_, i) => `198.51.100.${i + 1}`).sort(() => randomInt(3) - 1);
const address = () => unusedAddresses.pop() ?? `203.0.113.${randomInt(1, 254)}`;
const login = (api: TestApi, from: string, email: string, password: string) =>
  request(api.app).post('/api/auth/login').set('X-Forwarded-For', from).send({ email, password });

describe('sign-in throttling', () => {
  let one: TestApi;
  let two: TestApi;
  const clock = movableClock();
  beforeAll(async () => {
    const config = { loginRateLimit: 3, loginAddressLimit: 5, trustProxy: 'loopback' as const };
    one = await startTestApi({ config, clock });
    two = await startTestApi({ config, clock });
  });
  afterAll(async () => {
    await one.close();
    await two.close();
  });

  it('holds an address back after 5 refused passwords across different e-mails, on both instances', async () => {
    const from = address();
    const world = await makeWorld(one.ds);
    for (let i = 0; i < 5; i++) {
      const res = await login(i % 2 ? two : one, from, `nobody-${i}-${Date.now()}@factory.example`, 'wrong-password');
      expect(res.status).toBe(401);
    }
    const held = await login(two, from, world.qa.email, TEST_PASSWORD);
    expect(held.status).toBe(429);
    expect(Number(held.headers['retry-after'])).toBeGreaterThan(0);
    // Another address is not affected.
    expect((await login(one, address(), world.qa.email, TEST_PASSWORD)).status).toBe(200);
  });

  it('holds an account back with a growing wait, not 15 minutes at once, and the right password works after it', async () => {
    const world = await makeWorld(one.ds);
    for (let i = 0; i < 3; i++) expect((await login(one, address(), world.foreman.email, 'wrong')).status).toBe(401);
    const first = await login(two, address(), world.foreman.email, TEST_PASSWORD);
    expect(first.status).toBe(429);
    expect(Number(first.headers['retry-after'])).toBeLessThanOrEqual(60);
    clock.advance(61_000);
    try {
      expect((await login(one, address(), world.foreman.email, TEST_PASSWORD)).status).toBe(200);
    } finally {
      clock.advance(-61_000);
    }
  });

  it('lets a held account back in through a password reset link', async () => {
    const world = await makeWorld(one.ds);
    for (let i = 0; i < 4; i++) await login(one, address(), world.welder.email, 'wrong');
    expect((await login(one, address(), world.welder.email, TEST_PASSWORD)).status).toBe(429);
    await request(one.app).post('/api/auth/password-reset').send({ email: world.welder.email }).expect(202);
    const token = linkToken(await waitForMail(one.config.mailDir, world.welder.email));
    await request(one.app).post('/api/auth/set-password').send({ token, password: 'held-back-no-more-1' }).expect(200);
    expect((await login(two, address(), world.welder.email, 'held-back-no-more-1')).status).toBe(200);
  });

  it('does not count sign-ins refused because the database is away', async () => {
    const world = await makeWorld(one.ds);
    const config = testConfig();
    const proxy = await startTcpProxy({ host: config.db.host, port: config.db.port });
    const away = await startTestApi({
      config: { loginRateLimit: 1, trustProxy: 'loopback' },
      dataSource: createDataSource({ ...config.db, port: proxy.port }, { poolSize: 2 }),
    });
    const from = address();
    try {
      await proxy.cut();
      for (let i = 0; i < 3; i++) expect((await login(away, from, world.qa.email, 'wrong')).status).toBe(503);
      await proxy.restore();
      const rows = await one.ds.query<unknown[]>(`SELECT 1 FROM sign_in_throttle WHERE key = $1`, [world.qa.email]);
      expect(rows).toHaveLength(0);
      expect((await login(away, from, world.qa.email, TEST_PASSWORD)).status).toBe(200);
    } finally {
      await away.close();
      await proxy.cut();
    }
  });
});

describe('password reset answers before it looks anything up', () => {
  it('answers a real account as fast as an unknown one, however slow the mail is', async () => {
    const real = createMailer(testConfig().smtp);
    // The real mail catcher, reached two seconds late.
    const slow: Mailer = {
      send: async (m) => {
        await new Promise((r) => setTimeout(r, 2000));
        return real.send(m);
      },
      close: () => real.close(),
    };
    const api = await startTestApi({ mailer: slow });
    try {
      const world = await makeWorld(api.ds);
      const started = Date.now();
      await request(api.app).post('/api/auth/password-reset').send({ email: world.qa.email }).expect(202);
      expect(Date.now() - started).toBeLessThan(1500);
      await waitForMail(api.config.mailDir, world.qa.email);
    } finally {
      await api.close();
    }
  });
});
