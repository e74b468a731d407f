import { bench } from 'vitest';
import { continuityInput, TARGETS, BENCH_OPTIONS } from '../perf/inputs.js';
import { continuityStatus } from './continuity-status.js';

bench(
  `continuityStatus, 100 evidence dates (target ${TARGETS.continuityStatus} calls/s)`,
  () => {
    continuityStatus(continuityInput);
  },
  BENCH_OPTIONS,
);
