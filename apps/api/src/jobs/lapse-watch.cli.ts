// `npm run lapse-watch [-- --as-of YYYY-MM-DD]`: one lapse-watch run for every company, from the command
// line (a system scheduler instead of the in-process one). Each company's run is dated today in its own
// time zone; --as-of only guards that (it is refused, exit 2, when it is not every company's today —
// look at other days with Preview on the Lapse watch page). Exit 0 when the runs were written (or
// skipped), 1 when one failed.
import { parseArgs } from 'node:util';
import { isIsoDate } from '@beadroll/rules';
import { loadConfig } from '../config.js';
import { createDataSource, runMigrations } from '../db/data-source.js';
import { systemClock } from '../lib/context.js';
import { createLogger } from '../lib/logger.js';
import { createMailer } from '../lib/mailer.js';
import { AppError } from '../lib/errors.js';
import { runLapseWatch } from './lapse-watch.job.js';

const { values } = parseArgs({ options: { 'as-of': { type: 'string' } }, strict: true });
const asOf = values['as-of'];
if (asOf !== undefined && !isIsoDate(asOf)) {
  console.error(`beadroll: --as-of must be a real date written YYYY-MM-DD, not "${asOf}"`);
  process.exit(2);
}

const config = loadConfig();
const logger = createLogger(config);
const dataSource = createDataSource(config.db, { poolSize: 3 });
const mailer = createMailer(config.smtp);
try {
  await dataSource.initialize();
  await runMigrations(dataSource);
  const runs = await runLapseWatch(
    { config, dataSource, mailer, logger, clock: systemClock },
    { ...(asOf ? { asOf } : {}), trigger: 'cli' },
  );
  for (const r of runs)
    console.log(
      `beadroll: lapse watch ${r.asOf} ${r.status} company ${r.organizationId}: ` +
        `${r.noticesCreated} notices, ${r.emailsSent} e-mails sent, ${r.emailsFailed} failed${r.error ? ` (${r.error})` : ''}`,
    );
  if (runs.some((r) => r.status === 'failed')) process.exitCode = 1;
} catch (err) {
  if (err instanceof AppError && err.status === 400) {
    console.error(`beadroll: ${Object.values(err.fields ?? {}).join(' ') || err.message}`);
    process.exitCode = 2;
  } else {
    console.error(`beadroll: lapse watch failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exitCode = 1;
  }
} finally {
  mailer.close();
  if (dataSource.isInitialized) await dataSource.destroy();
}
