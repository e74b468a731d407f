// The words users see: every internal id has a trade name, and no rules message or limit text shows an
// internal code ('asme-ix', '49cfr-192.229c') where the trade writes "ASME IX" or "49 CFR 192.229(c)".
import { describe, expect, it } from 'vitest';
import { proposeBendSpecimens } from '../bend/propose-specimens.js';
import { continuityStatus } from '../continuity/continuity-status.js';
import { continuityProfiles } from '../continuity/profiles.js';
import { qualifiedRanges } from '../ranges/qualified-ranges.js';
import { codeIds, criteriaIds, type CodeId } from '../schemas/common.js';
import { processes, type CouponInput } from '../schemas/coupon.js';
import {
  cfrMonthCountings,
  continuityProfileIds,
  evidenceKinds,
  isoRevalidationOptions,
} from '../schemas/continuity.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { codeNames, displayName, displayNames } from './display-names.js';

const INTERNAL =
  /\b(asme-ix|aws-d1\.1|api-1104|iso-9606-1|shop-general|49cfr-|tested-weld|whole-months|same-day)/;

describe('display names', () => {
  it('every id of every kind has a name', () => {
    const expected: Record<keyof typeof displayNames, readonly string[]> = {
      codes: codeIds,
      criteria: criteriaIds,
      processes,
      profiles: continuityProfileIds,
      evidenceKinds,
      sourceKinds: ['published', 'regulation', 'from-memory', 'common-practice', 'beadroll-default'],
      monthCountings: cfrMonthCountings,
      isoRevalidations: isoRevalidationOptions,
    };
    for (const [kind, ids] of Object.entries(expected)) {
      expect(Object.keys(displayNames[kind as keyof typeof displayNames]).sort(), kind).toEqual(
        [...ids].sort(),
      );
      for (const id of ids)
        expect(displayName(kind as keyof typeof displayNames, id), `${kind} ${id}`).not.toMatch(INTERNAL);
    }
  });

  it('codes by the names the trade writes: ASME IX, AWS D1.1, API 1104, ISO 9606-1', () => {
    expect(codeNames).toEqual({
      'asme-ix': 'ASME IX',
      'aws-d1.1': 'AWS D1.1',
      'api-1104': 'API 1104',
      'iso-9606-1': 'ISO 9606-1',
    });
    expect(displayName('profiles', '49cfr-192.229c')).toMatch(/^49 CFR 192\.229\(c\)/);
    expect(displayName('codes', 'unknown-code')).toBe('unknown-code');
  });
});

const errorText = (fn: () => unknown): string => {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(RulesInputError);
    return Object.values((e as RulesInputError).fields).join(' | ');
  }
  throw new Error('expected a RulesInputError');
};

const coupon = (code: CodeId, more: Partial<CouponInput> = {}): CouponInput => ({
  code,
  process: 'SMAW',
  form: 'pipe',
  weld: 'groove',
  position: '5G',
  thickness: { value: 0.562, unit: 'in' },
  outsideDiameter: { value: 6.625, unit: 'in' },
  backing: false,
  fNumber: 4,
  progression: 'uphill',
  ...more,
});

describe('rules messages use the trade’s names, never internal codes', () => {
  it('limit texts and the notice of qualifiedRanges, for every code', () => {
    for (const code of codeIds) {
      const r = qualifiedRanges(coupon(code));
      for (const l of r.limits) expect(l.text, `${code} ${l.variable}`).not.toMatch(INTERNAL);
      expect(r.notice).not.toMatch(INTERNAL);
    }
  });

  it('refusals name the code: API 1104 on plate, a plate 2FR under AWS D1.1', () => {
    const plate = errorText(() => qualifiedRanges(coupon('api-1104', { form: 'plate', position: '1G' })));
    expect(plate).toContain('API 1104');
    expect(plate).not.toMatch(INTERNAL);
    const fillet = errorText(() =>
      qualifiedRanges(coupon('aws-d1.1', { form: 'plate', weld: 'fillet', position: '2FR' })),
    );
    expect(fillet).toContain('AWS D1.1');
    expect(fillet).not.toMatch(INTERNAL);
  });

  it('a code without a specimen table is named in words', () => {
    const p = proposeBendSpecimens({
      code: 'iso-9606-1',
      form: 'plate',
      position: '1G',
      depositedThickness: { value: 10, unit: 'mm' },
    });
    expect(p.text).toContain('ISO 9606-1');
    expect(p.text).not.toMatch(INTERNAL);
  });

  it('continuity requirement texts and the refusals of a bad code, criteria set or profile', () => {
    for (const profile of Object.values(continuityProfiles)) {
      const r = continuityStatus({
        code: profile.codes[0] as CodeId,
        profile: profile.id,
        qualifiedOn: '2025-01-01',
        evidence: [],
        asOf: '2025-02-01',
      });
      for (const q of r.requirements) expect(q.text, profile.id).not.toMatch(INTERNAL);
      expect(profile.wording).not.toMatch(INTERNAL);
    }
    const bad = errorText(() =>
      continuityStatus({
        code: 'asme',
        profile: 'cfr',
        qualifiedOn: '2025-01-01',
        evidence: [],
        asOf: '2025-02-01',
      } as never),
    );
    expect(bad).toContain('ASME IX');
    expect(bad).toContain('49 CFR 192.229');
    expect(bad).not.toMatch(INTERNAL);
  });
});
