// The bench inputs are what the bench names say (the speed itself is measured by npm run bench:rules, not
// by a timed test: the machine is shared and a timed test would fail with other people's load).
import { describe, expect, it } from 'vitest';
import { evaluateBendTest } from '../bend/evaluate-bend-test.js';
import { continuityStatus } from '../continuity/continuity-status.js';
import { jointWithin } from '../ranges/joint-within.js';
import { qualifiedRanges } from '../ranges/qualified-ranges.js';
import { bendInput, continuityInput, couponInput, jointInputs, jointRanges } from './inputs.js';

describe('bench inputs', () => {
  it('a joint within every limit, and one outside several; a welder current after 100 uses', () => {
    const [inside, outside] = jointInputs;
    expect(jointWithin(jointRanges, inside!).within).toBe(true);
    expect(jointWithin(jointRanges, outside!).reasons.length).toBeGreaterThan(1);
    expect(continuityInput.evidence).toHaveLength(100);
    expect(continuityStatus(continuityInput).state).toBe('current');
    expect(evaluateBendTest(bendInput).specimens).toHaveLength(2);
    expect(qualifiedRanges(couponInput).limits.length).toBeGreaterThan(3);
  });
});
