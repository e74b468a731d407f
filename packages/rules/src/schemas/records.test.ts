// Coupon bodies of the first request shape ({ method: 'bend' | 'radiography' | 'ultrasonic', … }) are read
// into the current one without losing anything the QA manager recorded.
import { describe, expect, it } from 'vitest';
import { upgradeExamination } from './records.js';

describe('upgradeExamination', () => {
  it("keeps the in-house criteria judged in addition to the code's (common practice (no source): a shop's stricter set never replaces the code's)", () => {
    const specimens = [{ kind: 'face', result: 'accept', discontinuities: [] }];
    expect(upgradeExamination({ method: 'bend', criteria: 'asme-ix', additionalCriteria: 'shop-general', specimens })).toEqual({
      criteria: 'asme-ix',
      additionalCriteria: 'shop-general',
      bend: { specimens },
    });
    expect(upgradeExamination({ method: 'radiography', result: 'accept', additionalCriteria: 'shop-general' })).toMatchObject({
      additionalCriteria: 'shop-general',
      volumetric: { method: 'radiography', examinerResult: 'accept' },
    });
  });

  it('adds nothing that was not sent', () => {
    expect(upgradeExamination({ method: 'bend', criteria: 'asme-ix', specimens: [] })).not.toHaveProperty('additionalCriteria');
  });
});
