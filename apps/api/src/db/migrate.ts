// `npm run migrate -w @beadroll/api`: applies pending migrations to the configured database.
import { loadConfig } from '../config.js';
import { createDataSource, runMigrations } from './data-source.js';

const config = loadConfig();
const dataSource = createDataSource(config.db, { poolSize: 1 });
try {
  await dataSource.initialize();
  const applied = await runMigrations(dataSource);
  console.log(
    applied.length > 0
      ? `beadroll: applied migrations ${applied.join(', ')} to ${config.db.database}`
      : `beadroll: ${config.db.database} is up to date`,
  );
} catch (err) {
  console.error(`beadroll: migration failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 1;
} finally {
  if (dataSource.isInitialized) await dataSource.destroy();
}
