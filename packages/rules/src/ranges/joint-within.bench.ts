import { bench } from 'vitest';
import { BENCH_OPTIONS, jointInputs, jointRanges, TARGETS } from '../perf/inputs.js';
import { jointWithin } from './joint-within.js';

const [inside, outside] = jointInputs as [(typeof jointInputs)[0], (typeof jointInputs)[0]];

bench(
  `jointWithin, a joint within every limit (target ${TARGETS.jointWithin} checks/s)`,
  () => {
    jointWithin(jointRanges, inside);
  },
  BENCH_OPTIONS,
);

bench(
  `jointWithin, a joint outside three limits, building their reasons (no target)`,
  () => {
    jointWithin(jointRanges, outside);
  },
  BENCH_OPTIONS,
);
