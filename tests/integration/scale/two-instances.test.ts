// Scale out (issue 11): two API instances — real `main.ts` processes, each with its own pool, scheduler and
// mailer — behind Debian's nginx on loopback, sharing one PostgreSQL database and one object store. What a
// person does through one instance holds on the other: a session, a sign-out, an uploaded file; and with
// both schedulers live and ticking every second, each company's daily lapse watch runs exactly once and
// each supervisor gets exactly one digest.
//
// Ports: nginx on PORT+5, the instances on PORT+6 and PORT+7 (npm test: 18085–18087). The test works in a
// database of its own (`<PGDATABASE>_scale`), so the schedulers see only the companies made here.
import { mkdtemp, rm } from 'node:fs/promises';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DataSource } from 'typeorm';
import { addDays, addMonths } from '@beadroll/rules';
import { loadConfig } from '../../../apps/api/src/config.js';
import { createDataSource, runMigrations } from '../../../apps/api/src/db/data-source.js';
import { todayIn } from '../../../apps/api/src/lib/dates.js';
import { SESSION_COOKIE } from '../../../apps/api/src/lib/auth.js';
import { samplePdf } from '../../support/api-records.js';
import { TEST_PASSWORD } from '../../support/factories.js';
import { mailsTo } from '../../support/mail.js';
import { startInstance, startNginx, stopChild, waitForHealth, type Child } from '../../support/scale-out.js';
import { makeLapseWorld, makeQualification } from '../lapse-watch/lapse-factories.js';

const base = loadConfig({ ...process.env, NODE_ENV: 'test' });
const lbPort = base.port + 5;
const ports = { a: base.port + 6, b: base.port + 7 };
const LB = `http://127.0.0.1:${lbPort}`;
const database = `${base.db.database}_scale`;

/** A fetch through the load balancer; which instance answered comes back in `upstream`. */
async function call(
  method: string,
  url: string,
  opts: { cookie?: string; json?: unknown; body?: FormData } = {},
): Promise<{ status: number; upstream: string; cookie: string | undefined; body: unknown; bytes: Buffer }> {
  const headers: Record<string, string> = {};
  if (opts.cookie) headers.cookie = opts.cookie;
  // A browser on the app's own page sends its origin with every write.
  if (method !== 'GET') headers.origin = LB;
  if (opts.json !== undefined) headers['content-type'] = 'application/json';
  const res = await fetch(`${LB}${url}`, {
    method,
    headers,
    body: opts.json !== undefined ? JSON.stringify(opts.json) : opts.body,
  });
  const bytes = Buffer.from(await res.arrayBuffer());
  const type = res.headers.get('content-type') ?? '';
  const setCookie = res.headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE}=`));
  return {
    status: res.status,
    upstream: res.headers.get('x-upstream') ?? '',
    cookie: setCookie?.split(';')[0],
    body: type.includes('json') && bytes.length ? JSON.parse(bytes.toString()) : null,
    bytes,
  };
}

/** Repeats a request through nginx until each instance has answered it; returns each one's answer. */
async function onEach(request: () => ReturnType<typeof call>) {
  const seen = new Map<string, Awaited<ReturnType<typeof call>>>();
  for (let i = 0; i < 10 && seen.size < 2; i++) {
    const res = await request();
    seen.set(res.upstream, res);
  }
  expect([...seen.keys()].sort()).toEqual([`127.0.0.1:${ports.a}`, `127.0.0.1:${ports.b}`].sort());
  return [...seen.values()];
}

describe('two API instances behind nginx', { timeout: 180_000 }, () => {
  let ds: DataSource;
  let dir: string;
  let nginx: Child | undefined;
  const instances: Child[] = [];
  const worlds: Awaited<ReturnType<typeof makeLapseWorld>>[] = [];

  beforeAll(async () => {
    // A database of its own, at the schema of this release (migrated once, before the instances start).
    const admin = createDataSource(base.db, { poolSize: 1 });
    await admin.initialize();
    await admin.query(`DROP DATABASE IF EXISTS "${database}" WITH (FORCE)`);
    await admin.query(`CREATE DATABASE "${database}"`);
    await admin.destroy();
    ds = createDataSource({ ...base.db, database }, { poolSize: 4 });
    await ds.initialize();
    await runMigrations(ds);

    // Every company is made before the schedulers start, with its run time hours away on its own clock
    // (about noon there, run at 23:00), so that no scheduler runs a company while its rows are made.
    const offset = 12 - new Date().getUTCHours();
    const zone = offset === 0 ? 'Etc/UTC' : `Etc/GMT${offset > 0 ? '-' : '+'}${Math.abs(offset)}`;
    const soon = addDays(todayIn(zone, new Date()), 10);
    for (let i = 0; i < 5; i++) {
      const w = await makeLapseWorld(ds);
      await ds.query(
        `INSERT INTO company_settings (organization_id, lapse_watch_time, time_zone) VALUES ($1, '23:00', $2)`,
        [w.org.id, zone],
      );
      const q = { lapsesOn: soon, lastEvidence: addMonths(soon, -6) };
      await makeQualification(ds, w.org, w.qa, w.weldersA[0]!, q);
      await makeQualification(ds, w.org, w.qa, w.weldersB[0]!, q);
      worlds.push(w);
    }

    dir = await mkdtemp(path.join(base.dataDir, 'scale-'));
    const shared = {
      NODE_ENV: 'test',
      PGDATABASE: database,
      // Every instance signs sessions with the same secret and serves the same address.
      JWT_SECRET: randomBytes(32).toString('hex'),
      APP_URL: LB,
      TRUST_PROXY: 'loopback',
      LAPSE_WATCH_ENABLED: 'true',
      LAPSE_WATCH_TICK: '* * * * * *',
      LOG_LEVEL: 'debug',
      WEB_DIST: path.join(dir, 'no-web'),
    };
    instances.push(startInstance('a', { ...shared, PORT: String(ports.a) }));
    instances.push(startInstance('b', { ...shared, PORT: String(ports.b) }));
    await Promise.all(
      instances.map((child, i) => waitForHealth(`http://127.0.0.1:${[ports.a, ports.b][i]}/api/health`, child)),
    );
    nginx = await startNginx(dir, lbPort, [ports.a, ports.b]);
  }, 150_000);

  afterAll(async () => {
    await stopChild(nginx);
    await Promise.all(instances.map(stopChild));
    await ds?.destroy();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it('keeps a session made on one instance on the other, and ends it on both with a sign-out on one', async () => {
    const w = worlds[0]!;
    const login = await call('POST', '/api/auth/login', { json: { email: w.qa.email, password: TEST_PASSWORD } });
    expect(login.status).toBe(200);
    const cookie = login.cookie!;
    expect(cookie.startsWith(`${SESSION_COOKIE}=`)).toBe(true);
    for (const me of await onEach(() => call('GET', '/api/me', { cookie }))) {
      expect(me.status).toBe(200);
      expect((me.body as { email: string }).email).toBe(w.qa.email);
    }
    const out = await call('POST', '/api/auth/logout', { cookie });
    expect(out.status).toBe(204);
    for (const me of await onEach(() => call('GET', '/api/me', { cookie }))) expect(me.status).toBe(401);
  });

  it('downloads through one instance a file uploaded through the other, byte for byte', async () => {
    const w = worlds[1]!;
    const { cookie } = await call('POST', '/api/auth/login', { json: { email: w.qa.email, password: TEST_PASSWORD } });
    const pdf = await samplePdf('Lab report LR-S-002: bend specimens examined on two instances');
    const form = new FormData();
    form.set('kind', 'other');
    form.set('file', new Blob([new Uint8Array(pdf)], { type: 'application/pdf' }), 'lab-report.pdf');
    const up = await call('POST', '/api/uploads', { cookie, body: form });
    expect(up.status).toBe(201);
    const id = (up.body as { id: string }).id;
    const downloads = await onEach(() => call('GET', `/api/uploads/${id}/content`, { cookie }));
    for (const d of downloads) {
      expect(d.status).toBe(200);
      expect(d.bytes.equals(pdf)).toBe(true);
    }
    expect(downloads.some((d) => d.upstream !== up.upstream)).toBe(true);
  });

  it("runs each company's lapse watch once a day with both schedulers live, one digest per supervisor", async () => {
    const companies = worlds.slice(2);
    const ids = companies.map((c) => c.org.id);
    const logsBefore = instances.map((i) => i.output().length);
    await ds.query(`UPDATE company_settings SET lapse_watch_time = '00:00' WHERE organization_id = ANY($1)`, [ids]);

    const scheduledRuns = () =>
      ds.query<{ organizationId: string; status: string; instance: string }[]>(
        `SELECT organization_id AS "organizationId", status, instance FROM lapse_watch_runs
          WHERE organization_id = ANY($1) AND trigger = 'schedule' AND status <> 'skipped'`,
        [ids],
      );
    const deadline = Date.now() + 60_000;
    while ((await scheduledRuns()).filter((r) => r.status === 'done').length < ids.length && Date.now() < deadline)
      await new Promise((r) => setTimeout(r, 250));
    // Both schedulers keep ticking every second for a while after the runs are done.
    await new Promise((r) => setTimeout(r, 4000));

    const runs = await scheduledRuns();
    expect(runs.map((r) => r.organizationId).sort()).toEqual([...ids].sort());
    expect(runs.every((r) => r.status === 'done')).toBe(true);
    for (const [i, instance] of instances.entries()) {
      // Each instance's scheduler ticked after the companies came due (LOG_LEVEL=debug logs every tick).
      const ticks = instance.output().slice(logsBefore[i]).match(/"msg":"lapse watch tick"/g) ?? [];
      expect(ticks.length, `ticks of instance ${instance.name}`).toBeGreaterThanOrEqual(3);
    }
    for (const c of companies)
      for (const u of [c.qa, c.qa2, c.foreman, c.foremanB]) {
        const digests = await mailsTo(base.mailDir, u.email);
        expect(digests, `digests to ${u.email}`).toHaveLength(1);
      }
  });
});
