// Browser journeys in Debian's Chromium against a running Beadroll (E2E_BASE_URL, set by `npm test`).
// One file at a time: they share the demo data and a single browser is plenty on 2 cores.
import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

export default defineConfig({
  root: fileURLToPath(new URL('..', import.meta.url)),
  test: {
    include: ['tests/e2e/**/*.spec.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
    maxWorkers: 1,
    sequence: { concurrent: false },
  },
});
