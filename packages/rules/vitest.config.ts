import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['src/**/*.test.ts'],
    // The throughput floor in src/perf must not share the machine's cores with other test files;
    // the whole suite runs in a few seconds one file at a time.
    fileParallelism: false,
    benchmark: { include: ['src/**/*.bench.ts'] },
  },
});
