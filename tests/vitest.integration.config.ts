// API integration tests: the real app in-process (supertest) against the real PostgreSQL, mail catcher
// and object store that docker-free-scripts/services.sh (or npm test) started. Connection settings come
// from the same environment variables as the API (PG*, SMTP_PORT, S3_PORT, DATA_DIR).
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

export default defineConfig({
  root: fileURLToPath(new URL('..', import.meta.url)),
  test: {
    name: 'integration',
    include: ['tests/integration/**/*.test.ts'],
    globalSetup: ['tests/support/api-global-setup.ts'],
    environment: 'node',
    pool: 'forks',
    // Files share a worker's module cache: the app's imports (AWS SDK, TypeORM) load once per worker, not per file.
    isolate: false,
    testTimeout: 20_000,
    hookTimeout: 30_000,
    env: { NODE_ENV: 'test', AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true' },
  },
});
