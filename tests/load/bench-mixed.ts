// `npm run bench:api:mixed`: a mixed read/write load on the demo data (issue 11) — sign-ins, the hot
// lists, month saves of the continuity grid and coupon saves — for 60 s at 50 connections, with autocannon.
// Target: 0 errors (connection failures, timeouts) and 0 5xx; every answer is a 2xx (each connection
// saves its own grid cell with the version it last got back, so no save is refused as stale). Prints the
// figures and the machine's load; exits 1 when the target is missed. Runs beside `npm run bench:api` and
// uses its demo database (beadroll_apibench) and port layout.
//   npm run bench:api:mixed [-- --seconds 60] [--connections 50]
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { cpus, loadavg } from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import pg from 'pg';
import { couponBody } from '../support/api-records.js';

const args = process.argv.slice(2);
const opt = (name: string, fallback: string) => {
  const i = args.indexOf(`--${name}`);
  return i >= 0 ? (args[i + 1] ?? fallback) : fallback;
};
const seconds = Number(opt('seconds', '60'));
const connections = Number(opt('connections', '50'));
const env = process.env;
const apiPort = Number(env.BENCH_API_PORT ?? Number(env.PORT ?? 8080) + 9);
const database = 'beadroll_apibench';
const base = `http://127.0.0.1:${apiPort}`;
const DEMO = { email: 'qa@beadroll-demo.example', password: 'demo-weld-2026' };

async function run(cmd: string, cmdArgs: string[], extraEnv: NodeJS.ProcessEnv): Promise<void> {
  const child = spawn(cmd, cmdArgs, {
    env: { ...env, ...extraEnv },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const [code] = (await once(child, 'exit')) as [number];
  if (code !== 0) throw new Error(`${cmdArgs.join(' ')} failed (exit ${code})`);
}

async function query<T extends pg.QueryResultRow>(sql: string, params: unknown[] = []): Promise<T[]> {
  const c = new pg.Client({
    host: env.PGHOST ?? '127.0.0.1',
    port: Number(env.PGPORT ?? 55432),
    user: env.PGUSER ?? 'beadroll',
    password: env.PGPASSWORD ?? 'beadroll',
    database,
  });
  await c.connect();
  try {
    return (await c.query<T>(sql, params)).rows;
  } finally {
    await c.end();
  }
}

async function startApi(): Promise<ChildProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', 'apps/api/src/main.ts'], {
    env: {
      ...env,
      NODE_ENV: 'development',
      PORT: String(apiPort),
      PGDATABASE: database,
      APP_URL: base,
      LAPSE_WATCH_ENABLED: 'false',
      VERIFY_RATE_LIMIT: '100000000',
      LOG_LEVEL: 'warn',
      WEB_DIST: path.resolve('apps/web/dist'),
    },
    stdio: ['ignore', 'ignore', 'inherit'],
    detached: true,
  });
  const until = Date.now() + 120_000;
  while (Date.now() < until) {
    try {
      if ((await fetch(`${base}/api/health`)).ok) return child;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error('the API did not start');
}

// The demo database: migrations and the demo scenario (idempotent), as bench:api makes it.
if ((await query<{ n: string }>(`SELECT 1 AS n`).catch(() => [])).length === 0)
  await run('bash', ['docker-free-scripts/pg.sh', 'reset-db', database], {});
await run(process.execPath, ['--import', 'tsx', 'apps/api/src/db/seed.ts'], {
  PGDATABASE: database,
  NODE_ENV: 'development',
  LOG_LEVEL: 'warn',
});

const api = await startApi();
try {
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(DEMO),
  });
  if (!login.ok) throw new Error(`sign-in failed: ${login.status}`);
  const cookie = (login.headers.get('set-cookie') ?? '').split(';')[0]!;
  const json = { cookie, 'content-type': 'application/json' };
  const month = new Date().toISOString().slice(0, 7);
  // One grid cell (shop, welder, process, month) per connection, from every shop's grid of this month and
  // the five before it, each with the version it has now; welders only in processes they are qualified in.
  const shops = await query<{ id: string }>(`SELECT id FROM shops WHERE active ORDER BY code`);
  type Grid = {
    rows: {
      welder: { id: string };
      qualifiedProcesses: string[];
      cells: Record<string, { version: number } | null>;
    }[];
  };
  const months = Array.from({ length: 6 }, (_, i) => {
    const d = new Date();
    d.setUTCDate(1);
    d.setUTCMonth(d.getUTCMonth() - i);
    return d.toISOString().slice(0, 7);
  });
  const cells: {
    shopId: string;
    month: string;
    welderId: string;
    process: string;
    version: number | null;
  }[] = [];
  for (const m of months)
    for (const sh of shops) {
      const g = (await (
        await fetch(`${base}/api/continuity/grid?shopId=${sh.id}&month=${m}`, { headers: { cookie } })
      ).json()) as Grid;
      for (const r of g.rows ?? [])
        for (const p of r.qualifiedProcesses)
          cells.push({
            shopId: sh.id,
            month: m,
            welderId: r.welder.id,
            process: p,
            version: r.cells[p]?.version ?? null,
          });
    }
  if (cells.length < connections)
    throw new Error(`${cells.length} grid cells for ${connections} connections`);
  const shop = shops.find((sh) => sh.id === cells[0]!.shopId);
  const [coupon] = await query<{ welderId: string; shopId: string; procedureId: string }>(
    `SELECT w.id AS "welderId", w.home_shop_id AS "shopId", p.id AS "procedureId"
       FROM welders w JOIN procedures p ON p.organization_id = w.organization_id AND p.code = 'asme-ix' AND 'SMAW' = ANY (p.processes) AND p.status = 'active'
      WHERE w.active ORDER BY w.stamp LIMIT 1`,
  );
  const couponJson = JSON.stringify(couponBody(coupon!));
  let nextCell = 0;
  let refusal = '';
  let couponRefusal = '';
  type Ctx = { cell?: (typeof cells)[number] };

  const statuses = new Map<string, Map<number, number>>();
  const count = (name: string) => (status: number) => {
    const m = statuses.get(name) ?? new Map<number, number>();
    m.set(status, (m.get(status) ?? 0) + 1);
    statuses.set(name, m);
  };
  const get = (name: string, p: string) => ({
    method: 'GET' as const,
    path: p,
    headers: { cookie },
    onResponse: count(name),
  });
  const requests = [
    {
      method: 'POST' as const,
      path: '/api/auth/login',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(DEMO),
      onResponse: count('sign-in'),
    },
    get('Welders list', '/api/welders?status=active&sort=stamp&dir=asc&page=1&pageSize=25'),
    get('Overview', '/api/overview'),
    get('continuity grid', `/api/continuity/grid?shopId=${shop!.id}&month=${month}`),
    {
      method: 'PUT' as const,
      path: '/api/continuity/grid',
      headers: json,
      setupRequest: (req: Record<string, unknown>, ctx: Ctx) => {
        ctx.cell ??= cells[nextCell++ % cells.length];
        const c = ctx.cell!;
        return {
          ...req,
          body: JSON.stringify({
            shopId: c.shopId,
            month: c.month,
            cells: [
              {
                welderId: c.welderId,
                process: c.process,
                usedOn: `${c.month}-01`,
                jobReference: `LOAD-${Date.now() % 100000}`,
                version: c.version,
              },
            ],
          }),
        };
      },
      onResponse: (status: number, body: string, ctx: Ctx) => {
        count('month save')(status);
        if (status !== 200 && !refusal) refusal = body.slice(0, 300);
        if (status !== 200 || !ctx.cell) return;
        const saved = JSON.parse(body) as Grid;
        const row = saved.rows.find((r) => r.welder.id === ctx.cell!.welderId);
        ctx.cell.version = row?.cells[ctx.cell.process]?.version ?? ctx.cell.version;
      },
    },
    get('Welders list, soonest lapse', '/api/welders?status=active&sort=lapsesOn&dir=asc&page=1&pageSize=25'),
    {
      method: 'POST' as const,
      path: '/api/coupons',
      headers: json,
      body: couponJson,
      onResponse: (status: number, body: string) => {
        count('coupon save')(status);
        if (status !== 201 && !couponRefusal) couponRefusal = body.slice(0, 300);
      },
    },
    get('welder file', `/api/welders/${coupon!.welderId}`),
  ];
  const started = loadavg()[0]!;
  const result = await autocannon({
    url: base,
    connections,
    duration: seconds,
    requests: requests as autocannon.Request[],
  });
  const ended = loadavg()[0]!;
  console.log(
    `\nMixed load on the demo data: ${seconds} s, ${connections} connections, ${cpus().length} cores, load ${started.toFixed(2)} → ${ended.toFixed(2)} (uptime 1-min average)`,
  );
  console.log(
    `  ${result.requests.total} requests, ${result.requests.average.toFixed(0)} req/s average, latency p50 ${result.latency.p50} ms, p99 ${result.latency.p99} ms`,
  );
  console.log(
    `  errors ${result.errors}, timeouts ${result.timeouts}, 2xx ${result['2xx']}, 4xx ${result['4xx']}, 5xx ${result['5xx']}`,
  );
  for (const [name, m] of statuses)
    console.log(`  ${name.padEnd(28)} ${[...m].map(([s, n]) => `${s}×${n}`).join('  ')}`);
  const ok = result.errors === 0 && result.timeouts === 0 && result['5xx'] === 0 && result['4xx'] === 0;
  if (refusal) console.log(`  first refused month save: ${refusal}`);
  if (couponRefusal) console.log(`  first refused coupon save: ${couponRefusal}`);
  console.log(ok ? '  target met: 0 errors, 0 5xx, every answer 2xx' : '  TARGET MISSED');
  process.exitCode = ok ? 0 : 1;
} finally {
  try {
    if (api.pid) process.kill(-api.pid, 'SIGTERM');
  } catch {
    /* already gone */
  }
  await once(api, 'exit');
}
