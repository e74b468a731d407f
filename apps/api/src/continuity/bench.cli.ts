// `npm run bench:continuity`: seeds a separate database (beadroll_bench, re-created each run) with 20,000
// welders, 60,000 qualifications and about 1.5 million evidence rows (generate_series in SQL), then prints
// as JSON the median milliseconds of several runs of: the lapse scan, one Welders page (50 rows, one shop,
// soonest lapse first), one 30-welder continuity-log month save, and the full recompute. Not a test.
import pg from 'pg';
import { loadConfig } from '../config.js';
import { createDataSource, runMigrations } from '../db/data-source.js';
import { createLogger } from '../lib/logger.js';
import { createMailer } from '../lib/mailer.js';
import { createStorage } from '../lib/storage.js';
import { systemClock, type AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { listWelders } from '../welders/welders.service.js';
import { saveGrid } from './continuity.service.js';
import { previewCandidates } from '../lapse-watch/lapse-watch.repository.js';
import { refreshAllContinuityStates, verifyContinuity } from './continuity-state.repository.js';

const BENCH_DB = 'beadroll_bench';
const WELDERS = 20_000;
const RUNS = 5;
const base = loadConfig();

async function recreateDatabase(): Promise<void> {
  const admin = new pg.Client({ ...clientOf(base.db), database: 'postgres' });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
  await admin.query(`CREATE DATABASE ${BENCH_DB} OWNER ${base.db.user}`);
  await admin.end();
}
function clientOf(db: typeof base.db) {
  return { host: db.host, port: db.port, user: db.user, password: db.password };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;
async function time(runs: number, fn: (i: number) => Promise<unknown>): Promise<number> {
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    await fn(i);
    ms.push(performance.now() - t);
  }
  return Math.round(median(ms) * 10) / 10;
}

await recreateDatabase();
const config = { ...base, db: { ...base.db, database: BENCH_DB } };
const ds = createDataSource(config.db, { poolSize: 4 });
await ds.initialize();
await runMigrations(ds);
const log = (m: string) => process.stderr.write(`bench: ${m}\n`);
const t0 = performance.now();
await ds.query(`SET statement_timeout = 0`);
const [org] = await ds.query<[{ id: string }]>(`INSERT INTO organizations (name) VALUES ('Bench Ironworks') RETURNING id`);
await ds.query(
  `INSERT INTO shops (organization_id, code, name, location)
   SELECT $1, 'S' || g, 'Bench shop ' || g, '' FROM generate_series(1, 8) g`,
  [org.id],
);
const [qa] = await ds.query<[{ id: string }]>(
  `INSERT INTO users (organization_id, email, name, role, active) VALUES ($1, 'qa@bench.example', 'Bench QA', 'qa_manager', true) RETURNING id`,
  [org.id],
);
await ds.query(
  `INSERT INTO welders (organization_id, stamp, name, home_shop_id, email, active)
   SELECT $1, 'B-' || lpad(g::text, 5, '0'), 'Bench welder ' || g,
          (SELECT id FROM shops WHERE organization_id = $1 AND code = 'S' || (1 + g % 8)), '', true
     FROM generate_series(1, ${WELDERS}) g`,
  [org.id],
);
const [wps] = await ds.query<[{ id: string }]>(
  `INSERT INTO procedures (organization_id, number, revision, code, processes, status)
   VALUES ($1, 'BENCH-1', 'A', 'asme-ix', '{SMAW,GTAW,FCAW}', 'active') RETURNING id`,
  [org.id],
);
// Three qualifications per welder (ASME IX SMAW and GTAW, AWS D1.1 FCAW), tested 20–28 months ago.
await ds.query(
  `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon, examiner,
                        visual, examination, result, rules_version)
   SELECT $1, w.id, w.home_shop_id, $2, current_date - 600 - (hashtext(w.id::text || p.process) & 255), p.code, p.process,
          '{}', '{"name":"Bench examiner"}', 'accept', '{}', 'accept', 'bench'
     FROM welders w CROSS JOIN (VALUES ('asme-ix', 'SMAW'), ('asme-ix', 'GTAW'), ('aws-d1.1', 'FCAW')) AS p(code, process)
    WHERE w.organization_id = $1`,
  [org.id, wps.id],
);
await ds.query(
  `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on, certified_by,
                               certified_by_name, rules_version)
   SELECT organization_id, welder_id, id, code, process, '{}', tested_on, $2, 'Bench QA', 'bench'
     FROM coupons WHERE organization_id = $1`,
  [org.id, qa.id],
);
// Monthly use from the month after each test (about 24 months per qualification). A working company: use of most (85 %) runs up to last month
// or the month before (current), about 8 % stopped five months ago (lapsing within a month or two) and
// about 7 % six to nine months ago (lapsed), so every state occurs in realistic proportions.
await ds.query(
  `INSERT INTO continuity_entries (organization_id, welder_id, shop_id, process, month, used_on, job_reference)
   SELECT c.organization_id, c.welder_id, c.shop_id, c.process, m.month, m.month + (hashtext(c.id::text || m.month) & 15), 'JOB-' || (hashtext(m.month::text) & 4095)
     FROM coupons c
     CROSS JOIN LATERAL (
       SELECT (date_trunc('month', c.tested_on) + make_interval(months => g))::date AS month
         FROM generate_series(1, 36) g
     ) m
    WHERE c.organization_id = $1
      AND m.month < date_trunc('month', current_date)::date - make_interval(months => (
            SELECT CASE WHEN h < 85 THEN h % 2 WHEN h < 93 THEN 4 ELSE 6 + h % 4 END
              FROM (SELECT (hashtext(c.id::text) & 65535) % 100 AS h) x))
`,
  [org.id],
);
await ds.query(`ANALYZE`);
const [counts] = await ds.query<[{ welders: number; qualifications: number; evidence: number }]>(
  `SELECT (SELECT count(*) FROM welders)::int AS welders, (SELECT count(*) FROM qualifications)::int AS qualifications,
          (SELECT count(*) FROM continuity_entries)::int + (SELECT count(*) FROM coupons)::int AS evidence`,
);
log(`seeded ${JSON.stringify(counts)} in ${Math.round(performance.now() - t0)} ms; storing states`);
await refreshAllContinuityStates(ds.manager, org.id);
await ds.query(`ANALYZE`);

// The shape of the company as of today, printed with the timings.
const [states] = await ds.query<[{ current: number; lapsing: number; lapsed: number }]>(
  `SELECT count(*) FILTER (WHERE lapses_on - current_date > 30)::int AS current,
          count(*) FILTER (WHERE lapses_on - current_date BETWEEN 1 AND 30)::int AS lapsing,
          count(*) FILTER (WHERE lapses_on <= current_date)::int AS lapsed
     FROM continuity_states WHERE organization_id = $1`,
  [org.id],
);

const deps: AppDeps = {
  config,
  dataSource: ds,
  mailer: createMailer(config.smtp),
  storage: createStorage(config.s3),
  logger: createLogger({ ...config, logLevel: 'silent' }),
  clock: systemClock,
};
const actor: Actor = { id: qa.id, organizationId: org.id, role: 'qa_manager', welderId: null, shopIds: [] };
const [shop] = await ds.query<[{ id: string }]>(`SELECT id FROM shops WHERE organization_id = $1 AND code = 'S1'`, [org.id]);
const crew = await ds.query<{ id: string }[]>(
  `SELECT w.id FROM welders w WHERE w.home_shop_id = $1 ORDER BY w.stamp LIMIT 30`,
  [shop.id],
);
const today = new Date().toISOString().slice(0, 10);

// The lapse-watch job's own scan (lapse watch's repository): lapses since the previous day's run and
// those within the largest lead time, read through continuity_states' (organization_id, lapses_on) index.
const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
const scanWindow = { organizationId: org.id, asOf: today, lapsedSince: yesterday, warnDays: [30, 7] };
const lapseScan = await time(RUNS + 2, () => previewCandidates(ds.manager, scanWindow));
const weldersPage = await time(RUNS + 2, () =>
  listWelders(deps, actor, { shopId: shop.id, status: 'active', sort: 'lapsesOn', dir: 'asc', page: 1, pageSize: 50 }),
);
// A client sends each cell's version (the grid it last read); the save answers with the new grid.
type SavedGrid = Awaited<ReturnType<typeof saveGrid>>;
function versionsOf(grid: SavedGrid | null): Map<string, number> {
  const v = new Map<string, number>();
  for (const r of grid?.rows ?? [])
    for (const [process, cell] of Object.entries(r.cells)) if (cell) v.set(`${r.welder.id}:${process}`, cell.version);
  return v;
}
function monthSaveOf(shopId: string, welders: { id: string }[], cellCount: number) {
  let versions = new Map<string, number>();
  return async (i: number) => {
    const cells = welders
      .flatMap((w) => ['SMAW', 'GTAW', 'FCAW'].map((process) => ({ welderId: w.id, process: process as 'SMAW' })))
      .slice(0, cellCount)
      .map((c) => ({
        ...c,
        usedOn: `${today.slice(0, 7)}-01`,
        jobReference: `BENCH-${i}`,
        note: '',
        version: versions.get(`${c.welderId}:${c.process}`) ?? null,
      }));
    versions = versionsOf(await saveGrid(deps, actor, { shopId, month: today.slice(0, 7), cells, remove: [] }));
  };
}
const monthSave = await time(RUNS, monthSaveOf(shop.id, crew, 90));
// A big shop's month in one request: 2,000 cells (667 welders of shop S2, three processes each).
const [bigShop] = await ds.query<[{ id: string }]>(`SELECT id FROM shops WHERE organization_id = $1 AND code = 'S2'`, [org.id]);
const bigCrew = await ds.query<{ id: string }[]>(`SELECT w.id FROM welders w WHERE w.home_shop_id = $1 ORDER BY w.stamp LIMIT 667`, [bigShop.id]);
const bigMonthSave = await time(3, monthSaveOf(bigShop.id, bigCrew, 2000));
const fullRecompute = await time(3, () =>
  ds.transaction(async (db) => {
    await db.query(`SET LOCAL statement_timeout = 0`);
    // As `continuity:verify` runs it: one walk of every pair, three checks against the stored state.
    await db.query(`SET LOCAL work_mem = '512MB'`);
    const { states, soonest, flags } = await verifyContinuity(db);
    if (states.length) throw new Error(`${states.length} pairs differ after the bench saves`);
    if (soonest.length) throw new Error(`${soonest.length} welders' soonest lapse differs after the bench saves`);
    if (flags.length) throw new Error(`${flags.length} review flags differ after the bench saves`);
  }),
);
// The same walk storing every pair (what the seed and a migration run): nothing has changed since the
// saves, so it writes nothing, and the time is the walk, the re-flag and the welders' soonest lapse.
// Printed for information: the target is for the recompute above (what continuity:verify runs).
const fullRefresh = await time(1, () =>
  ds.transaction(async (db) => {
    await db.query(`SET LOCAL statement_timeout = 0`);
    await db.query(`SET LOCAL work_mem = '512MB'`);
    await refreshAllContinuityStates(db, org.id);
  }),
);
console.log(
  JSON.stringify(
    {
      ...counts,
      states,
      monthSaveCells: crew.length * 3,
      bigMonthSaveCells: Math.min(2000, bigCrew.length * 3),
      medianMs: { lapseScan, weldersPage, monthSave, bigMonthSave, fullRecompute, fullRefresh },
      targetsMs: { lapseScan: 50, weldersPage: 50, monthSave: 200, bigMonthSave: 2_000, fullRecompute: 10_000 },
    },
    null,
    2,
  ),
);
deps.mailer.close();
deps.storage.close();
await ds.destroy();
