// A guard against gross slowdowns in plain `npm test`: each rule must reach half its bench target (the
// full targets are measured by `npm run bench`). Timed with performance.now(), best of five rounds after
// a warm-up. The machine is shared: when this process got well under one core during the rounds (CPU
// time far below wall time), the rate per CPU-second is what is held to the floor, so other people's
// builds do not fail the test while a real slowdown still does.
import { describe, expect, it } from 'vitest';
import { evaluateBendTest } from '../bend/evaluate-bend-test.js';
import { continuityStatus } from '../continuity/continuity-status.js';
import { qualifiedRanges } from '../ranges/qualified-ranges.js';
import { jointWithin } from '../ranges/joint-within.js';
import { bendInput, continuityInput, couponInput, jointInputs, jointRanges, TARGETS } from './inputs.js';

type Rate = { wall: number; cpu: number; share: number };

function callsPerSecond(fn: () => unknown, calls: number): Rate {
  for (let i = 0; i < calls / 4; i++) fn();
  let best: Rate = { wall: 0, cpu: 0, share: 0 };
  for (let round = 0; round < 5; round++) {
    const cpu0 = process.cpuUsage();
    const start = performance.now();
    for (let i = 0; i < calls; i++) fn();
    const wallMs = performance.now() - start;
    const used = process.cpuUsage(cpu0);
    const cpuMs = (used.user + used.system) / 1000;
    const rate = {
      wall: (calls / wallMs) * 1000,
      cpu: (calls / Math.max(cpuMs, 1e-3)) * 1000,
      share: cpuMs / wallMs,
    };
    if (rate.wall > best.wall) best = rate;
  }
  return best;
}

function expectFloor(rate: Rate, floor: number): void {
  const held = rate.wall >= floor || (rate.share < 0.8 && rate.cpu >= floor);
  expect(
    held,
    `${Math.round(rate.wall)} calls/s by the clock, ${Math.round(rate.cpu)} per CPU-second (${Math.round(rate.share * 100)} % of a core); floor ${floor}`,
  ).toBe(true);
}

describe('throughput floor (half the bench target)', () => {
  it(`evaluateBendTest: at least ${TARGETS.evaluateBendTest / 2} calls/s`, () => {
    expectFloor(
      callsPerSecond(() => evaluateBendTest(bendInput), 20_000),
      TARGETS.evaluateBendTest / 2,
    );
  });

  it(`qualifiedRanges: at least ${TARGETS.qualifiedRanges / 2} calls/s`, () => {
    expectFloor(
      callsPerSecond(() => qualifiedRanges(couponInput), 20_000),
      TARGETS.qualifiedRanges / 2,
    );
  });

  it(`jointWithin: at least ${TARGETS.jointWithin / 2} checks/s`, () => {
    const [inside, outside] = jointInputs;
    expect(jointWithin(jointRanges, inside!).within).toBe(true);
    expect(jointWithin(jointRanges, outside!).reasons.length).toBeGreaterThan(1);
    let i = 0;
    expectFloor(
      callsPerSecond(() => jointWithin(jointRanges, jointInputs[i++ & 1]!), 50_000),
      TARGETS.jointWithin / 2,
    );
  });

  it(`continuityStatus with 100 evidence dates: at least ${TARGETS.continuityStatus / 2} calls/s`, () => {
    expect(continuityStatus(continuityInput).state).toBe('current');
    expectFloor(
      callsPerSecond(() => continuityStatus(continuityInput), 5_000),
      TARGETS.continuityStatus / 2,
    );
  });
});
