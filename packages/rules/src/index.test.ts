// The package as the API and the web import it: by its workspace name.
import * as rules from '@beadroll/rules';
import { describe, expect, it } from 'vitest';

describe('@beadroll/rules public API', () => {
  it('exports the names the issue asks for, and the foundation contracts', () => {
    for (const name of [
      'evaluateBendTest',
      'qualifiedRanges',
      'continuityStatus',
      'parseLength',
      'formatLength',
      'pipeDimensions',
      'criteriaSets',
      'proposeBendSpecimens',
      'fNumberInterchange',
      'processes',
      'testPositions',
      'iso6947Positions',
      'lapseRules',
      'lapseRuleFor',
      'RulesInputError',
      'RULES_VERSION',
      'bendTestInputSchema',
      'bendCriteriaSchema',
      'couponSchema',
      'continuityInputSchema',
      'lengthSchema',
      'loginInput',
      'welderInput',
    ])
      expect(rules, name).toHaveProperty(name);
    expect(rules.RULES_VERSION).toMatch(/^\d+\.\d+\.\d+$/);
    expect(Object.keys(rules.criteriaSets).sort()).toEqual([
      'api-1104',
      'asme-ix',
      'aws-d1.1',
      'iso-9606-1',
      'shop-general',
    ]);
  });

  it('types compose: a Length from parseLength feeds a coupon', () => {
    const thickness: rules.Length = rules.parseLength('3/8 in');
    const code: rules.CodeId = 'asme-ix';
    const r = rules.qualifiedRanges({
      code,
      process: 'GTAW',
      form: 'plate',
      weld: 'groove',
      position: '1G',
      thickness,
      backing: false,
    });
    expect(r.thickness.max).toEqual({ value: 0.75, unit: 'in' });
    const custom: rules.BendCriteria = { ...rules.criteriaSets['asme-ix'], id: 'copy' };
    const criteriaId: rules.CriteriaId = 'shop-general';
    expect(
      rules.evaluateBendTest({
        criteria: custom,
        specimens: [
          { kind: 'face', discontinuities: [] },
          { kind: 'root', discontinuities: [] },
        ],
      }).result,
    ).toBe('accept');
    expect(
      rules.evaluateBendTest({
        criteria: criteriaId,
        specimens: [
          { kind: 'face', discontinuities: [] },
          { kind: 'root', discontinuities: [] },
        ],
      }).result,
    ).toBe('accept');
  });
});
