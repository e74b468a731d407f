// `npm run continuity:verify`: recomputes every (welder, process, code) pair in one set-based query and
// prints the pairs whose stored continuity state differs. Exit 1 when any differ.
import { loadConfig } from '../config.js';
import { createDataSource } from '../db/data-source.js';
import { differingStates } from './continuity-state.repository.js';

const config = loadConfig();
const dataSource = createDataSource(config.db, { poolSize: 1 });
try {
  await dataSource.initialize();
  const started = performance.now();
  const rows = await dataSource.transaction(async (db) => {
    await db.query(`SET LOCAL statement_timeout = '120s'`);
    await db.query(`SET LOCAL work_mem = '128MB'`);
    return differingStates(db);
  });
  const [{ n }] = await dataSource.query<[{ n: number }]>(`SELECT count(*)::int AS n FROM continuity_states`);
  const ms = Math.round(performance.now() - started);
  for (const r of rows) console.log(JSON.stringify(r));
  console.log(
    rows.length === 0
      ? `beadroll: continuity states verified: ${n} pairs agree with the full recompute (${ms} ms)`
      : `beadroll: ${rows.length} of ${n} pairs differ from the full recompute (${ms} ms)`,
  );
  if (rows.length > 0) process.exitCode = 1;
} catch (err) {
  console.error(`beadroll: continuity verify failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 2;
} finally {
  if (dataSource.isInitialized) await dataSource.destroy();
}
