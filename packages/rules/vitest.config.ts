import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['src/**/*.test.ts'],
    // The machine is shared: the whole suite runs in a few seconds one file at a time. Speed is measured
    // by npm run bench:rules, not by a timed test.
    fileParallelism: false,
    benchmark: { include: ['src/**/*.bench.ts'] },
  },
});
