import { bench } from 'vitest';
import { couponInput, TARGETS, BENCH_OPTIONS } from '../perf/inputs.js';
import { qualifiedRanges } from './qualified-ranges.js';

bench(
  `qualifiedRanges, ASME 6G pipe coupon (target ${TARGETS.qualifiedRanges} calls/s)`,
  () => {
    qualifiedRanges(couponInput);
  },
  BENCH_OPTIONS,
);
