// `npm run continuity:verify`: recomputes every (welder, process, code) pair in one set-based query and
// prints what the stored state gets wrong: pairs whose continuity state differs, welders whose soonest
// lapse differs, and logged use whose review flag differs. Exit 1 when anything differs.
import { loadConfig } from '../config.js';
import { createDataSource } from '../db/data-source.js';
import { verifyContinuity } from './continuity-state.repository.js';

const config = loadConfig();
const dataSource = createDataSource(config.db, { poolSize: 1 });
try {
  await dataSource.initialize();
  const started = performance.now();
  const { states, soonest, flags } = await dataSource.transaction(async (db) => {
    // Not READ ONLY: the one walk is kept in a temporary table for the three checks. One snapshot for
    // them all, so a write between them cannot show as a difference.
    await db.query(`SET TRANSACTION ISOLATION LEVEL REPEATABLE READ`);
    await db.query(`SET LOCAL statement_timeout = '120s'`);
    // The walk sorts every evidence row once; in memory rather than on disk (a batch job, one session).
    await db.query(`SET LOCAL work_mem = '512MB'`);
    return verifyContinuity(db);
  });
  const [{ n }] = await dataSource.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM continuity_states`);
  const ms = Math.round(performance.now() - started);
  for (const r of states) console.log(JSON.stringify({ kind: 'state', ...r }));
  for (const r of soonest) console.log(JSON.stringify({ kind: 'soonest-lapse', ...r }));
  for (const r of flags) console.log(JSON.stringify({ kind: 'review-flag', ...r }));
  const differ = states.length + soonest.length + flags.length;
  console.log(
    differ === 0
      ? `beadroll: continuity verified: ${n} pairs, the welders' soonest lapse and the review flags agree with the full recompute (${ms} ms)`
      : `beadroll: continuity differs from the full recompute: ${states.length} of ${n} pairs, ${soonest.length} welders' soonest lapse, ${flags.length} review flags (${ms} ms)`,
  );
  if (differ > 0) process.exitCode = 1;
} catch (err) {
  console.error(`beadroll: continuity verify failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 2;
} finally {
  if (dataSource.isInitialized) await dataSource.destroy();
}
