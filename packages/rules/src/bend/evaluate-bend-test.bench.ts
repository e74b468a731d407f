import { bench } from 'vitest';
import { bendInput, TARGETS, BENCH_OPTIONS } from '../perf/inputs.js';
import { evaluateBendTest } from './evaluate-bend-test.js';

bench(
  `evaluateBendTest, two specimens (target ${TARGETS.evaluateBendTest} calls/s)`,
  () => {
    evaluateBendTest(bendInput);
  },
  BENCH_OPTIONS,
);
