// Fixed inputs for the throughput checks and benches: a typical coupon, a typical set of bend specimens,
// and a welder with 100 documented uses.
import { type BendTestInput } from '../schemas/bend.js';
import { type ContinuityInput } from '../schemas/continuity.js';
import { type CouponInput } from '../schemas/coupon.js';
import { addDays } from '../continuity/calendar.js';
import { type Joint } from '../schemas/examination.js';
import { qualifiedRanges } from '../ranges/qualified-ranges.js';

export const bendInput: BendTestInput = {
  criteria: 'aws-d1.1',
  specimens: [
    {
      id: 'F1',
      kind: 'face',
      discontinuities: [{ size: { value: 0.0625, unit: 'in' }, location: 'surface', type: 'porosity' }],
    },
    {
      id: 'R1',
      kind: 'root',
      discontinuities: [
        { size: { value: 0.1, unit: 'in' }, location: 'surface' },
        { size: { value: 0.2, unit: 'in' }, location: 'corner', type: 'crack' },
      ],
    },
  ],
};

export const couponInput: CouponInput = {
  code: 'asme-ix',
  process: 'SMAW',
  form: 'pipe',
  weld: 'groove',
  position: '6G',
  thickness: { value: 0.432, unit: 'in' },
  outsideDiameter: { value: 6.625, unit: 'in' },
  backing: false,
  fNumber: 4,
  progression: 'uphill',
};

// 100 uses, about every 25 days, so the qualification stays current throughout
export const continuityInput: ContinuityInput = {
  code: 'asme-ix',
  qualifiedOn: '2018-01-10',
  evidence: Array.from({ length: 100 }, (_, i) => ({
    date: addDays('2018-01-20', i * 25),
    kind: 'use' as const,
  })),
  asOf: addDays('2018-01-20', 99 * 25 + 10),
};

// The crew finder asks one joint of many welders' ranges: the ranges are computed once, the joint checked
// each time. A joint within every limit (the whole check runs) and one that fails on three.
export const jointRanges = qualifiedRanges(couponInput);
export const jointInputs: Joint[] = [
  {
    form: 'pipe',
    weld: 'groove',
    position: 'V',
    thickness: { value: 0.5, unit: 'in' },
    outsideDiameter: { value: 8.625, unit: 'in' },
    fNumber: 4,
    backing: false,
    progression: 'uphill',
  },
  {
    form: 'pipe',
    weld: 'groove',
    position: 'V',
    thickness: { value: 25, unit: 'mm' },
    outsideDiameter: { value: 60.3, unit: 'mm' },
    fNumber: 5,
    backing: false,
    progression: 'downhill',
  },
];

export const TARGETS = {
  evaluateBendTest: 200_000,
  qualifiedRanges: 200_000,
  continuityStatus: 50_000,
  jointWithin: 500_000,
};

/** Long enough to warm up the JIT and average out a busy shared machine. */
export const BENCH_OPTIONS = { time: 2000, warmupTime: 500, warmupIterations: 2000 };
