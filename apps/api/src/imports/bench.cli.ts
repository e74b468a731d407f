// `npm run bench:import`: a 50,000-row continuity history through the real import path (upload to the
// object store, dry run, commit with progress, continuity state refresh), against a separate database
// (beadroll_bench_import, re-created each run) holding 2,100 welders with three qualifications each.
// Prints the timings as JSON with the machine's load. Target (issue 13): the commit of 50,000 rows < 60 s.
import { loadavg } from 'node:os';
import { Readable } from 'node:stream';
import pg from 'pg';
import { loadConfig } from '../config.js';
import { createDataSource, runMigrations } from '../db/data-source.js';
import { createLogger } from '../lib/logger.js';
import { createMailer } from '../lib/mailer.js';
import { createStorage } from '../lib/storage.js';
import { systemClock, type AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { checkImport, commitImport, getImport, receiveImportFile, uploadImport } from './imports.service.js';

const BENCH_DB = 'beadroll_bench_import';
const WELDERS = 2_100;
const ROWS = 50_000;
const base = loadConfig();
const log = (m: string) => process.stderr.write(`bench: ${m}\n`);

const admin = new pg.Client({ host: base.db.host, port: base.db.port, user: base.db.user, password: base.db.password, database: 'postgres' });
await admin.connect();
await admin.query(`DROP DATABASE IF EXISTS ${BENCH_DB} WITH (FORCE)`);
await admin.query(`CREATE DATABASE ${BENCH_DB} OWNER ${base.db.user}`);
await admin.end();

const config = { ...base, db: { ...base.db, database: BENCH_DB } };
const ds = createDataSource(config.db, { poolSize: 4 });
await ds.initialize();
await runMigrations(ds);
const [org] = await ds.query<[{ id: string }]>(`INSERT INTO organizations (name) VALUES ('Bench Boilerworks') RETURNING id`);
await ds.query(`INSERT INTO shops (organization_id, code, name, location) SELECT $1, 'S' || g, 'Bench shop ' || g, '' FROM generate_series(1, 4) g`, [org.id]);
const [qa] = await ds.query<[{ id: string }]>(
  `INSERT INTO users (organization_id, email, name, role, active) VALUES ($1, 'qa@bench.example', 'Bench QA', 'qa_manager', true) RETURNING id`,
  [org.id],
);
await ds.query(
  `INSERT INTO welders (organization_id, stamp, name, home_shop_id)
   SELECT $1, 'B-' || lpad(g::text, 5, '0'), 'Bench welder ' || g, (SELECT id FROM shops WHERE organization_id = $1 AND code = 'S' || (1 + g % 4))
     FROM generate_series(1, ${WELDERS}) g`,
  [org.id],
);
const [wps] = await ds.query<[{ id: string }]>(
  `INSERT INTO procedures (organization_id, number, revision, code, processes, status)
   VALUES ($1, 'BENCH-1', 'A', 'asme-ix', '{SMAW,GTAW,FCAW}', 'active') RETURNING id`,
  [org.id],
);
await ds.query(
  `INSERT INTO coupons (organization_id, welder_id, shop_id, procedure_id, tested_on, code, process, coupon, examiner,
                        visual, examination, result, rules_version)
   SELECT $1, w.id, w.home_shop_id, $2, current_date - 400, 'asme-ix', p.process, '{}', '{"name":"Bench examiner"}', 'accept', '{}', 'accept', 'bench'
     FROM welders w CROSS JOIN (VALUES ('SMAW'), ('GTAW'), ('FCAW')) AS p(process) WHERE w.organization_id = $1`,
  [org.id, wps.id],
);
await ds.query(
  `INSERT INTO qualifications (organization_id, welder_id, coupon_id, code, process, ranges, certified_on, certified_by, certified_by_name, rules_version)
   SELECT organization_id, welder_id, id, code, process, '{}', tested_on, $2, 'Bench QA', 'bench' FROM coupons WHERE organization_id = $1`,
  [org.id, qa.id],
);
await ds.query(`ANALYZE`);

// The spreadsheet: one row per welder, process and month over the last 8 months, days and jobs varied.
const lines = ['Welder stamp,Process,Date used,Job number,Shop'];
const today = new Date();
outer: for (let m = 1; m <= 8; m++)
  for (let w = 1; w <= WELDERS; w++)
    for (const p of ['SMAW', 'GTAW', 'FCAW']) {
      if (lines.length > ROWS) break outer;
      const d = new Date(Date.UTC(today.getUTCFullYear(), today.getUTCMonth() - m, 1 + ((w * 7 + m) % 27)));
      lines.push(`B-${String(w).padStart(5, '0')},${p},${d.toISOString().slice(0, 10)},JOB-${(w * 31 + m) % 9000},S${1 + (w % 4)}`);
    }
const file = Buffer.from(lines.join('\n'));

const deps: AppDeps = {
  config,
  dataSource: ds,
  mailer: createMailer(config.smtp),
  storage: createStorage(config.s3),
  logger: createLogger({ ...config, logLevel: 'silent' }),
  clock: systemClock,
};
const actor: Actor = { id: qa.id, organizationId: org.id, role: 'qa_manager', welderId: null, shopIds: [] };

const ms = (t: number) => Math.round(performance.now() - t);
async function importOnce() {
  let t = performance.now();
  const stored = await receiveImportFile(deps, actor, { stream: Readable.from([file]), originalname: 'bench.csv' });
  const up = await uploadImport(deps, actor, 'continuity', stored);
  const uploadMs = ms(t);
  t = performance.now();
  const checked = await checkImport(deps, actor, up.id, { mapping: up.mapping, dateFormat: 'iso' });
  const checkMs = ms(t);
  if (checked.report!.errors > 0) throw new Error(JSON.stringify(checked.report!.issues.slice(0, 5)));
  t = performance.now();
  const { done } = await commitImport(deps, actor, up.id);
  let polls = 0;
  for (;;) {
    const v = await getImport(deps, actor, up.id);
    if (v.status !== 'running') {
      if (v.status !== 'committed') throw new Error(`import ${v.status}: ${v.error}`);
      break;
    }
    polls++;
    await new Promise((r) => setTimeout(r, 250));
  }
  await done;
  const commitMs = ms(t);
  return { rows: checked.report!.rows, new: checked.report!.new, unchanged: checked.report!.unchanged, uploadMs, checkMs, commitMs, progressPolls: polls };
}

log(`${ROWS} rows, ${(file.byteLength / 1e6).toFixed(1)} MB; importing`);
const load = loadavg().map((l) => Math.round(l * 100) / 100);
const first = await importOnce();
const [states] = await ds.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM continuity_states WHERE organization_id = $1`, [org.id]);
const again = await importOnce();
console.log(JSON.stringify({ loadBefore: load, loadAfter: loadavg().map((l) => Math.round(l * 100) / 100), cpus: (await import('node:os')).cpus().length, first, continuityStates: states.n, reimport: again }, null, 1));
deps.mailer.close();
deps.storage.close();
await ds.destroy();
