// Boots the API: configuration, database (with migrations), mail, object store, HTTP (API + built web
// app), and stops all of it cleanly on SIGINT/SIGTERM. Scheduled jobs join here when they exist.
import { createServer } from 'node:http';
import { existsSync } from 'node:fs';
import { loadConfig } from './config.js';
import { createLogger } from './lib/logger.js';
import { createDataSource, runMigrations } from './db/data-source.js';
import { createMailer } from './lib/mailer.js';
import { createStorage } from './lib/storage.js';
import { systemClock } from './lib/context.js';
import { createApp } from './app.js';
import { startLapseWatchSchedule } from './jobs/lapse-watch.job.js';
import { startLinkMailSchedule } from './jobs/link-mail.job.js';
import { startUploadSweep } from './jobs/upload-sweep.job.js';

const config = loadConfig();
const logger = createLogger(config);
const dataSource = createDataSource(config.db);

try {
  await dataSource.initialize();
  const applied = await runMigrations(dataSource);
  if (applied.length > 0) logger.info({ migrations: applied }, 'applied migrations');
} catch (err) {
  logger.fatal(
    { err },
    `cannot prepare the database ${config.db.database} on ${config.db.host}:${config.db.port}`,
  );
  process.exit(1);
}

const mailer = createMailer(config.smtp);
const storage = createStorage(config.s3);
if (!existsSync(config.webDist)) logger.warn(`no web build at ${config.webDist}; serving the API only`);
const app = createApp({
  config,
  dataSource,
  mailer,
  storage,
  logger,
  clock: systemClock,
  webDist: config.webDist,
});

const lapseWatch = config.lapseWatchEnabled
  ? startLapseWatchSchedule({ config, dataSource, mailer, logger, clock: systemClock })
  : null;
const linkMails = startLinkMailSchedule({ config, dataSource, mailer, logger, clock: systemClock });

const uploadSweep = config.uploadSweepEnabled
  ? startUploadSweep({ config, dataSource, mailer, storage, logger, clock: systemClock })
  : null;

const server = createServer(app);
server.on('error', (err) => {
  logger.fatal({ err }, `cannot listen on ${config.host}:${config.port}`);
  process.exit(1);
});
server.listen(config.port, config.host, () => {
  logger.info(`Beadroll is serving http://${config.host}:${config.port} (${config.nodeEnv})`);
});

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  logger.info(`${signal}: stopping`);
  // Let requests in flight finish; drop idle keep-alive connections now and the rest after 5 s.
  const forced = setTimeout(() => server.closeAllConnections(), 5000);
  forced.unref();
  server.closeIdleConnections();
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await lapseWatch?.stop();
  await linkMails.stop();
  await uploadSweep?.stop();
  mailer.close();
  storage.close();
  await dataSource.destroy();
  logger.info('stopped');
  process.exit(0);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
