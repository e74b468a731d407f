// Once per integration run: bring the test database's schema up to date with the API's own migrations.
import { loadConfig } from '../../apps/api/src/config.js';
import { createDataSource, runMigrations } from '../../apps/api/src/db/data-source.js';

export default async function setup(): Promise<void> {
  const config = loadConfig();
  const dataSource = createDataSource(config.db, { poolSize: 1 });
  try {
    await dataSource.initialize();
  } catch (err) {
    throw new Error(
      `Integration tests need PostgreSQL at ${config.db.host}:${config.db.port}/${config.db.database} ` +
        `(start it with: bash docker-free-scripts/services.sh up): ${(err as Error).message}`,
      { cause: err },
    );
  }
  try {
    await runMigrations(dataSource);
  } finally {
    await dataSource.destroy();
  }
}
