// `npm run bench:crew`: the crew finder against the 20,000-welder / 60,000-qualification bench company of
// `npm run bench:continuity` (database beadroll_bench; that script seeds it when it is missing). The bench
// seed gives every qualification empty ranges, so this script first gives each one the ranges of one of
// eight kinds of coupon per process (computed by the rules package, chosen by a hash of its id), once.
// Then it prints, as JSON with the machine's load average, the median milliseconds of the finder: the
// whole company and one shop, a 6G pipe joint through six weeks and a plate joint through today, cold
// (first call of the process) and warm, each answer the first page (50) of the crew and of the near
// misses with their exact totals. Target (issue 12): < 100 ms. Not a test.
import { spawnSync } from 'node:child_process';
import { cpus, loadavg } from 'node:os';
import pg from 'pg';
import { addDays, qualifiedRanges, type CouponInput } from '@beadroll/rules';
import { loadConfig } from '../config.js';
import { createDataSource, runMigrations } from '../db/data-source.js';
import { createLogger } from '../lib/logger.js';
import { createMailer } from '../lib/mailer.js';
import { createStorage } from '../lib/storage.js';
import { systemClock, type AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { companyToday } from '../settings/settings.repository.js';
import { findCrew } from './crew-finder.service.js';

const BENCH_DB = 'beadroll_bench';
const TARGET_MS = 100;
const RUNS = 9;
const base = loadConfig();
const log = (m: string) => process.stderr.write(`bench: ${m}\n`);
const load = () => loadavg().map((l) => Math.round(l * 100) / 100);

async function benchWelders(): Promise<number> {
  const client = new pg.Client({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password, database: 'postgres' });
  await client.connect();
  const { rows } = await client.query<{ n: number }>(`SELECT count(*)::int AS n FROM pg_database WHERE datname = $1`, [BENCH_DB]);
  await client.end();
  if (!rows[0]?.n) return 0;
  const bench = new pg.Client({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password, database: BENCH_DB });
  await bench.connect();
  const r = await bench.query<{ n: number }>(`SELECT count(*)::int AS n FROM welders`).catch(() => ({ rows: [{ n: 0 }] }));
  await bench.end();
  return r.rows[0]?.n ?? 0;
}

if ((await benchWelders()) < 20_000) {
  log('no bench company yet: running npm run bench:continuity to seed it');
  const run = spawnSync('npm', ['run', 'bench:continuity'], { stdio: 'inherit' });
  if (run.status !== 0) process.exit(run.status ?? 1);
}

const config = { ...base, db: { ...base.db, database: BENCH_DB } };
const ds = createDataSource(config.db, { poolSize: 4 });
await ds.initialize();
// A bench company seeded before the latest migrations gets them (indexes the finder reads).
await runMigrations(ds);

// Eight kinds of coupon per process: pipe and plate, positions, thicknesses, backing, F-No., progression.
function kinds(code: 'asme-ix' | 'aws-d1.1', process: 'SMAW' | 'GTAW' | 'FCAW'): CouponInput[] {
  const pipe = (position: string, wall: number, od: number, more: Partial<CouponInput> = {}): CouponInput =>
    ({ code, process, form: 'pipe', weld: 'groove', position, thickness: { value: wall, unit: 'in' }, outsideDiameter: { value: od, unit: 'in' }, layers: 3, backing: false, fNumber: process === 'GTAW' ? 6 : 4, progression: 'uphill', ...more });
  const plate = (position: string, t: number, more: Partial<CouponInput> = {}): CouponInput =>
    ({ code, process, form: 'plate', weld: 'groove', position, thickness: { value: t, unit: 'in' }, layers: 3, backing: true, fNumber: process === 'GTAW' ? 6 : 4, progression: 'uphill', ...more });
  return [
    // Test pipes both codes compute ranges for: NPS 6 Sch 120, NPS 2 Sch 80, NPS 3 Sch 40, NPS 8 Sch 80.
    pipe('6G', 0.562, 6.625),
    pipe('6G', 0.218, 2.375),
    pipe('5G', 0.216, 3.5),
    pipe('2G', 0.5, 8.625, { backing: true }),
    plate('3G', 0.375),
    plate('4G', 1),
    plate('1G', 0.375, { backing: false }),
    plate('3G', 0.375, { progression: 'downhill' }),
  ];
}
const [{ n: empty }] = await ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM qualifications WHERE ranges = '{}'::jsonb`);
if (empty > 0) {
  log(`giving ${empty} qualifications the ranges of eight kinds of coupon per process`);
  const values = (['SMAW', 'GTAW', 'FCAW'] as const).flatMap((process) => {
    const code = process === 'FCAW' ? 'aws-d1.1' : 'asme-ix';
    return kinds(code, process).map((c, n) => ({ code, process, n, ranges: qualifiedRanges(c) }));
  });
  await ds.query(`SET statement_timeout = 0`);
  await ds.query(
    `UPDATE qualifications q SET ranges = v.ranges
       FROM jsonb_to_recordset($1::jsonb) AS v(code text, process text, n int, ranges jsonb)
      WHERE q.code = v.code AND q.process = v.process AND (hashtext(q.id::text) & 7) = v.n AND q.ranges = '{}'::jsonb`,
    [JSON.stringify(values)],
  );
  await ds.query(`VACUUM ANALYZE qualifications`);
}

const deps: AppDeps = {
  config,
  dataSource: ds,
  mailer: createMailer(config.smtp),
  storage: createStorage(config.s3),
  logger: createLogger({ ...config, logLevel: 'silent' }),
  clock: systemClock,
};
const [org] = await ds.query<[{ id: string; qa: string }]>(
  `SELECT o.id, u.id AS qa FROM organizations o JOIN users u ON u.organization_id = o.id AND u.role = 'qa_manager' LIMIT 1`,
);
const [shop] = await ds.query<[{ id: string }]>(`SELECT id FROM shops WHERE organization_id = $1 ORDER BY code LIMIT 1`, [org.id]);
const actor: Actor = { id: org.qa, organizationId: org.id, role: 'qa_manager', welderId: null, shopIds: [] };
const today = await companyToday(ds.manager, actor, systemClock);

const pipeJoint = {
  process: 'SMAW' as const,
  through: addDays(today, 42),
  joint: { form: 'pipe' as const, weld: 'groove' as const, position: 'F' as const, thickness: { value: 0.432, unit: 'in' as const }, outsideDiameter: { value: 6.625, unit: 'in' as const }, backing: false, fNumber: 4, progression: 'uphill' as const },
  positions: ['F', 'H', 'V', 'O'] as ('F' | 'H' | 'V' | 'O')[],
};
const plateJoint = {
  process: 'GTAW' as const,
  joint: { form: 'plate' as const, weld: 'groove' as const, position: 'V' as const, thickness: { value: 0.5, unit: 'in' as const }, backing: true, fNumber: 6, progression: 'uphill' as const },
  positions: ['V'] as 'V'[],
};

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] as number;
async function time(fn: () => Promise<unknown>): Promise<{ firstMs: number; medianMs: number }> {
  const ms: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await fn();
    ms.push(performance.now() - t);
  }
  return { firstMs: Math.round((ms[0] as number) * 10) / 10, medianMs: Math.round(median(ms) * 10) / 10 };
}

const loadBefore = load();
const companyPipe = await time(() => findCrew(deps, actor, pipeJoint));
const shopPipe = await time(() => findCrew(deps, actor, { ...pipeJoint, shopId: shop.id }));
const companyPlate = await time(() => findCrew(deps, actor, plateJoint));
const sample = await findCrew(deps, actor, pipeJoint);
const result = {
  welders: (await ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM welders`))[0].n,
  qualifications: (await ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM qualifications`))[0].n,
  pipeJointCrew: sample.crew.total,
  pipeJointNearMisses: sample.nearMisses.total,
  ms: { companyPipe, shopPipe, companyPlate },
  targetMs: TARGET_MS,
  load: { before: loadBefore, after: load(), cpus: cpus().length },
};
console.log(JSON.stringify(result, null, 2));
deps.mailer.close();
deps.storage.close();
await ds.destroy();
const worst = Math.max(companyPipe.medianMs, shopPipe.medianMs, companyPlate.medianMs);
if (worst >= TARGET_MS) {
  log(`median ${worst} ms is over the ${TARGET_MS} ms target`);
  process.exitCode = 1;
}
