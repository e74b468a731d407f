// `npm run bench:api`: autocannon against a bare Express 5 route and Beadroll's hot read routes, in one
// run, on the demo data and on the 20,000-welder bench data (`npm run bench:continuity` makes it).
// Target per hot route: at least 25 % of the bare route's requests per second at 50 connections, and a
// p99 latency under 100 ms. Prints a table per data set and the machine's load; exits 1 when a target is
// missed. Not a test: the machine is shared, so read the ratios together with the load.
//   npm run bench:api [-- --data demo,bench] [--seconds 10] [--connections 50]
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { createServer } from 'node:http';
import { loadavg, cpus } from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import { hashPassword } from '../../apps/api/src/auth/passwords.js';

const args = process.argv.slice(2);
const opt = (name: string, fallback: string) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? (args[i + 1] ?? fallback) : fallback;
};
const datasets = opt('data', 'demo,bench').split(',');
const seconds = Number(opt('seconds', '10'));
const connections = Number(opt('connections', '50'));
const env = process.env;
const apiPort = Number(env.BENCH_API_PORT ?? Number(env.PORT ?? 8080) + 7);
const barePort = apiPort + 1;
const TARGET_SHARE = 0.25;
const TARGET_P99_MS = 100;
const PASSWORD = 'bench-api-password-2026';

interface Result {
  name: string;
  rps: number;
  p50: number;
  p99: number;
  errors: number;
  non2xx: number;
}

function cannon(name: string, url: string, headers: Record<string, string> = {}): Promise<Result> {
  return new Promise((resolve, reject) => {
    autocannon({ url, connections, duration: seconds, headers }, (err, r) => {
      if (err) return reject(err instanceof Error ? err : new Error(String(err)));
      resolve({
        name,
        rps: r.requests.average,
        p50: r.latency.p50,
        p99: r.latency.p99,
        errors: r.errors + r.timeouts,
        non2xx: r.non2xx,
      });
    });
  });
}

async function bareBaseline(): Promise<Result> {
  // The same Express 5 the API uses, one JSON route, nothing else.
  const app = express();
  app.get('/bare', (_req, res) => {
    res.json({ ok: true, items: [] });
  });
  const server = createServer(app).listen(barePort, '127.0.0.1');
  await once(server, 'listening');
  // A separate process would be fairer to the API; measure it in this process between two warm-ups
  // instead, with autocannon's own work counted against it (it can only lower the baseline).
  await cannon('warm-up', `http://127.0.0.1:${barePort}/bare`);
  const result = await cannon('bare Express 5 route', `http://127.0.0.1:${barePort}/bare`);
  server.close();
  return result;
}

async function withDb<T>(database: string, fn: (c: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({
    host: env.PGHOST ?? '127.0.0.1',
    port: Number(env.PGPORT ?? 55432),
    user: env.PGUSER ?? 'beadroll',
    password: env.PGPASSWORD ?? 'beadroll',
    database,
  });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

async function run(cmd: string, cmdArgs: string[], extraEnv: NodeJS.ProcessEnv): Promise<void> {
  const child = spawn(cmd, cmdArgs, { env: { ...env, ...extraEnv }, stdio: ['ignore', 'inherit', 'inherit'] });
  const [code] = (await once(child, 'exit')) as [number];
  if (code !== 0) throw new Error(`${cmdArgs.join(' ')} failed (exit ${code})`);
}

async function databaseExists(name: string): Promise<boolean> {
  return withDb('postgres', async (c) => (await c.query('SELECT 1 FROM pg_database WHERE datname = $1', [name])).rowCount === 1);
}

/** The data set's database, its QA manager's e-mail, a welder to open and a verify token to read. */
async function prepare(dataset: string) {
  if (dataset === 'demo') {
    const database = 'beadroll_apibench';
    if (!(await databaseExists(database))) await run('bash', ['docker-free-scripts/pg.sh', 'reset-db', database], {});
    // Idempotent: migrations, then the demo scenario when it is missing.
    await run(process.execPath, ['--import', 'tsx', 'apps/api/src/db/seed.ts'], { PGDATABASE: database, NODE_ENV: 'development', LOG_LEVEL: 'warn' });
    return { database, email: 'qa@beadroll-demo.example' };
  }
  const database = 'beadroll_bench';
  if (!(await databaseExists(database))) await run('npm', ['run', '--silent', 'bench:continuity'], {});
  // The bench data's QA manager has no password: give it one for this run.
  const hash = await hashPassword(PASSWORD);
  await withDb(database, (c) => c.query(`UPDATE users SET password_hash = $1 WHERE email = 'qa@bench.example'`, [hash]));
  return { database, email: 'qa@bench.example' };
}

async function startApi(database: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'apps/api/src/main.ts'], {
    env: {
      ...env,
      NODE_ENV: 'development',
      PORT: String(apiPort),
      PGDATABASE: database,
      APP_URL: `http://127.0.0.1:${apiPort}`,
      LAPSE_WATCH_ENABLED: 'false',
      // The public verify route is limited per client address; every bench request comes from one.
      VERIFY_RATE_LIMIT: '100000000',
      WEB_DIST: path.resolve('apps/web/dist'),
    },
    stdio: ['ignore', 'ignore', 'inherit'],
    detached: true,
  });
  const until = Date.now() + 120_000;
  while (Date.now() < until) {
    try {
      if ((await fetch(`http://127.0.0.1:${apiPort}/api/health`)).ok) return child;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error('the API did not start');
}

async function benchDataset(dataset: string, bare: Result): Promise<boolean> {
  const { database, email } = await prepare(dataset);
  const api = await startApi(database);
  const base = `http://127.0.0.1:${apiPort}`;
  try {
    const login = await fetch(`${base}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email, password: dataset === 'demo' ? 'demo-weld-2026' : PASSWORD }),
    });
    if (!login.ok) throw new Error(`sign-in as ${email} failed: ${login.status}`);
    const cookie = (login.headers.get('set-cookie') ?? '').split(';')[0]!;
    const headers = { cookie };
    const picked = await withDb(database, async (c) => {
      // The welder with the most qualifications: the heaviest welder file and verify page.
      const w = await c.query<{ id: string }>(
        `SELECT w.id FROM welders w JOIN qualifications q ON q.welder_id = w.id
          GROUP BY w.id ORDER BY count(*) DESC, w.id LIMIT 1`,
      );
      const shop = await c.query<{ id: string }>(`SELECT home_shop_id AS id FROM welders WHERE id = $1`, [w.rows[0]!.id]);
      return { welderId: w.rows[0]!.id, shopId: shop.rows[0]!.id };
    });
    // A verify link for that welder, issued the way the QA manager does it (the bench's own databases).
    const issued = await fetch(`${base}/api/welders/${picked.welderId}/verify-token`, { method: 'POST', headers });
    const token = ((await issued.json()) as { url: string }).url.split('/').pop() ?? '';
    const month = new Date().toISOString().slice(0, 7);
    const routes: [string, string, Record<string, string>][] = [
      ['Welders list', '/api/welders?status=active&sort=stamp&dir=asc&page=1&pageSize=25', headers],
      ['Welders list, soonest lapse', '/api/welders?status=active&sort=lapsesOn&dir=asc&page=1&pageSize=25', headers],
      ['welder file', `/api/welders/${picked.welderId}`, headers],
      ['welder qualifications', `/api/qualifications?welderId=${picked.welderId}&state=all`, headers],
      ['Overview', '/api/overview', headers],
      ['continuity grid', `/api/continuity/grid?shopId=${picked.shopId}&month=${month}`, headers],
      ['verify (public)', `/api/verify/${token}`, {}],
    ];
    const results: Result[] = [];
    for (const [name, route, h] of routes) {
      const probe = await fetch(`${base}${route}`, { headers: h });
      if (!probe.ok) throw new Error(`${name}: GET ${route} answered ${probe.status}`);
      await cannon('warm-up', `${base}${route}`, h);
      results.push(await cannon(name, `${base}${route}`, h));
    }
    return report(dataset, bare, results);
  } finally {
    if (api.pid) process.kill(-api.pid, 'SIGTERM');
    await once(api, 'exit');
  }
}

function report(dataset: string, bare: Result, results: Result[]): boolean {
  console.log(`\n${dataset} data, ${connections} connections, ${seconds} s per route, load ${loadavg().map((l) => l.toFixed(2)).join(' ')} on ${cpus().length} cores`);
  console.log('route'.padEnd(30) + 'req/s'.padStart(9) + 'share'.padStart(8) + 'p50 ms'.padStart(8) + 'p99 ms'.padStart(8) + '  verdict');
  const line = (r: Result, verdict: string) =>
    console.log(
      r.name.padEnd(30) +
        r.rps.toFixed(0).padStart(9) +
        `${((r.rps / bare.rps) * 100).toFixed(1)}%`.padStart(8) +
        String(r.p50).padStart(8) +
        String(r.p99).padStart(8) +
        `  ${verdict}`,
    );
  line(bare, 'baseline');
  let ok = true;
  for (const r of results) {
    const misses: string[] = [];
    if (r.rps < bare.rps * TARGET_SHARE) misses.push(`under ${TARGET_SHARE * 100} %`);
    if (r.p99 >= TARGET_P99_MS) misses.push(`p99 ≥ ${TARGET_P99_MS} ms`);
    if (r.errors > 0 || r.non2xx > 0) misses.push(`${r.errors} errors, ${r.non2xx} non-2xx`);
    if (misses.length) ok = false;
    line(r, misses.length ? `MISS (${misses.join(', ')})` : 'ok');
  }
  return ok;
}

// PostgreSQL, and the object store and mail catcher the demo seed writes to.
await run('bash', ['docker-free-scripts/services.sh', 'up'], {});
console.log(`bench:api: load ${loadavg().map((l) => l.toFixed(2)).join(' ')} on ${cpus().length} cores before the run`);
const bare = await bareBaseline();
let allOk = true;
for (const dataset of datasets) allOk = (await benchDataset(dataset, bare)) && allOk;
console.log(allOk ? '\nbench:api: every hot route met its target' : '\nbench:api: some routes missed their target');
process.exit(allOk ? 0 : 1);
