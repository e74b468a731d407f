import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type BendCriteria, type BendTestInput, type Discontinuity } from '../schemas/bend.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { criteriaSets } from './criteria-sets.js';
import { evaluateBendTest, type BendResult } from './evaluate-bend-test.js';

type D = Discontinuity;
const surface = (value: number, unit: 'in' | 'mm' = 'in', extra: Partial<D> = {}): D => ({
  size: { value, unit },
  location: 'surface',
  ...extra,
});
const corner = (value: number, unit: 'in' | 'mm' = 'in', extra: Partial<D> = {}): D => ({
  size: { value, unit },
  location: 'corner',
  ...extra,
});
// The specimen under test is a face bend; a clean root bend completes the set.
const judge = (criteria: BendTestInput['criteria'], ds: D[], more: Partial<BendTestInput> = {}) =>
  evaluateBendTest({
    criteria,
    specimens: [
      { id: 'S1', kind: 'face', discontinuities: ds },
      { id: 'R1', kind: 'root', discontinuities: [] },
    ],
    ...more,
  });
const result = (
  criteria: BendTestInput['criteria'],
  ds: D[],
  more: Partial<BendTestInput> = {},
): BendResult => judge(criteria, ds, more).result;

describe('asme-ix', () => {
  it('published: ASME IX QW-163 (read second-hand) — 1/8 in exactly accepts, just over rejects, just under accepts', () => {
    expect(result('asme-ix', [surface(0.125)])).toBe('accept');
    expect(result('asme-ix', [surface(0.126)])).toBe('reject');
    expect(result('asme-ix', [surface(0.124)])).toBe('accept');
  });

  it('published: ASME IX QW-163 (read second-hand) — in mm the SI value 3 mm applies: 3 accepts, 3.1 rejects, 2.9 accepts', () => {
    expect(result('asme-ix', [surface(3, 'mm')])).toBe('accept');
    expect(result('asme-ix', [surface(3.1, 'mm')])).toBe('reject');
    expect(result('asme-ix', [surface(2.9, 'mm')])).toBe('accept');
  });

  it('published: ASME IX QW-163 (read second-hand) — no cumulative limit: many 1/8 in indications accept', () => {
    expect(result('asme-ix', [surface(0.125), surface(0.125), surface(0.125), surface(0.125)])).toBe(
      'accept',
    );
  });

  it('published: ASME IX QW-163 (read second-hand) — corner cracks are not considered unless from lack of fusion or slag', () => {
    expect(result('asme-ix', [corner(0.5)])).toBe('accept');
    expect(result('asme-ix', [corner(0.126, 'in', { fusionRelated: true })])).toBe('reject');
    expect(result('asme-ix', [corner(0.126, 'in', { type: 'slag' })])).toBe('reject');
    expect(result('asme-ix', [corner(0.126, 'in', { type: 'lack-of-fusion' })])).toBe('reject');
    expect(result('asme-ix', [corner(0.125, 'in', { fusionRelated: true })])).toBe('accept');
  });

  it('common practice (no source): undercut or porosity opened by bending counts like any discontinuity', () => {
    expect(result('asme-ix', [surface(0.13, 'in', { type: 'undercut' })])).toBe('reject');
    expect(result('asme-ix', [surface(0.13, 'in', { type: 'porosity' })])).toBe('reject');
  });

  it('rejects a root bend with a 3/16 in crack, naming the clause and the measured and allowed sizes', () => {
    const r = evaluateBendTest({
      criteria: 'asme-ix',
      specimens: [
        { id: 'F1', kind: 'face', discontinuities: [] },
        { id: 'R1', kind: 'root', discontinuities: [surface(0.1875, 'in', { type: 'crack' })] },
      ],
    });
    expect(r.result).toBe('reject');
    expect(r.specimens.map((s) => s.result)).toEqual(['accept', 'reject']);
    expect(r.specimens[1]?.reasons).toEqual([
      {
        clause: 'ASME IX QW-163',
        message:
          'Crack 1 (3/16 in) is larger than the largest single discontinuity allowed (measured 3/16 in, allowed 1/8 in).',
      },
    ]);
    expect(r.specimens[1]).toMatchObject({ id: 'R1', kind: 'root' });
  });
});

describe('aws-d1.1', () => {
  it('from memory: AWS D1.1 4.9.3.3 (2015) — single discontinuity 1/8 in (3 mm): at accepts, over rejects', () => {
    expect(result('aws-d1.1', [surface(0.125)])).toBe('accept');
    expect(result('aws-d1.1', [surface(0.1251)])).toBe('reject');
    expect(result('aws-d1.1', [surface(3, 'mm')])).toBe('accept');
    expect(result('aws-d1.1', [surface(3.01, 'mm')])).toBe('reject');
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — sum of those over 1/32 in up to 3/8 in: exactly 3/8 accepts, just over rejects', () => {
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125)])).toBe('accept');
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125), surface(0.04)])).toBe(
      'reject',
    );
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.124)])).toBe('accept');
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — discontinuities of 1/32 in or less are not counted', () => {
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125), surface(1 / 32)])).toBe(
      'accept',
    );
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125), surface(0.0313)])).toBe(
      'reject',
    );
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — in mm: counted over 1 mm, sum at most 10 mm', () => {
    expect(result('aws-d1.1', [surface(3, 'mm'), surface(3, 'mm'), surface(3, 'mm'), surface(1, 'mm')])).toBe(
      'accept',
    );
    expect(
      result('aws-d1.1', [surface(3, 'mm'), surface(3, 'mm'), surface(3, 'mm'), surface(1.1, 'mm')]),
    ).toBe('reject');
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — corner crack up to 1/4 in accepts; over 1/4 in calls for a replacement specimen', () => {
    expect(result('aws-d1.1', [corner(0.25)])).toBe('accept');
    expect(result('aws-d1.1', [corner(0.249)])).toBe('accept');
    expect(result('aws-d1.1', [corner(0.251)])).toBe('replace-specimen');
    expect(result('aws-d1.1', [corner(6, 'mm')])).toBe('accept');
    expect(result('aws-d1.1', [corner(6.1, 'mm')])).toBe('replace-specimen');
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — a corner crack from visible slag is held to 1/8 in', () => {
    expect(result('aws-d1.1', [corner(0.2, 'in', { type: 'slag' })])).toBe('reject');
    expect(result('aws-d1.1', [corner(0.125, 'in', { fusionRelated: true })])).toBe('accept');
  });

  it('explains a replacement with the clause and the sizes', () => {
    const r = judge('aws-d1.1', [corner(0.3, 'in', { type: 'crack' })]);
    expect(r.specimens[0]?.reasons[0]?.clause).toBe(criteriaSets['aws-d1.1'].clause);
    expect(r.specimens[0]?.reasons[0]?.message).toMatch(
      /replacement from the same coupon \(measured 0.3 in, allowed up to 1\/4 in\)/,
    );
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — a sum over the limit says what was added up', () => {
    const r = judge('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125), surface(0.0625)]);
    expect(r.specimens[0]?.reasons[0]?.message).toBe(
      'The 4 counted discontinuities (counting those over 1/32 in) add up to more than allowed on one specimen (measured 7/16 in in all, allowed 3/8 in).',
    );
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — a test recorded in mm is judged on the 1 mm floor and 10 mm sum', () => {
    // 4 × 2.6 mm = 10.4 mm > 10 mm; 0.9 mm indications are not counted (1 mm floor)
    expect(
      result('aws-d1.1', [surface(2.6, 'mm'), surface(2.6, 'mm'), surface(2.6, 'mm'), surface(2.6, 'mm')]),
    ).toBe('reject');
    expect(
      result('aws-d1.1', [surface(3, 'mm'), surface(3, 'mm'), surface(3, 'mm'), surface(0.9, 'mm')]),
    ).toBe('accept');
  });
});

describe('api-1104', () => {
  const wall = (value: number, unit: 'in' | 'mm' = 'in') => ({ wallThickness: { value, unit } });

  it('from memory: API 1104 bend test acceptance — 1/8 in or one-half the wall, whichever is smaller', () => {
    // 0.500 in wall: half is 1/4 in, so 1/8 in governs
    expect(result('api-1104', [surface(0.125)], wall(0.5))).toBe('accept');
    expect(result('api-1104', [surface(0.126)], wall(0.5))).toBe('reject');
    // 0.188 in wall: half is 0.094 in
    expect(result('api-1104', [surface(0.094)], wall(0.188))).toBe('accept');
    expect(result('api-1104', [surface(0.095)], wall(0.188))).toBe('reject');
    expect(result('api-1104', [surface(0.093)], wall(0.188))).toBe('accept');
    // exactly at a wall of 1/4 in: both limits are 1/8 in
    expect(result('api-1104', [surface(0.125)], wall(0.25))).toBe('accept');
  });

  it('from memory: API 1104 bend test acceptance — in mm: 3 mm or half a 5 mm wall (2.5 mm)', () => {
    expect(result('api-1104', [surface(2.5, 'mm')], wall(5, 'mm'))).toBe('accept');
    expect(result('api-1104', [surface(2.6, 'mm')], wall(5, 'mm'))).toBe('reject');
    expect(result('api-1104', [surface(3, 'mm')], wall(10, 'mm'))).toBe('accept');
    expect(result('api-1104', [surface(3.1, 'mm')], wall(10, 'mm'))).toBe('reject');
  });

  it('from memory: API 1104 bend test acceptance — edge cracks under 1/4 in are not considered; 1/4 in and over are', () => {
    expect(result('api-1104', [corner(0.249)], wall(0.5))).toBe('accept');
    expect(result('api-1104', [corner(0.25)], wall(0.5))).toBe('reject');
    expect(result('api-1104', [corner(5.9, 'mm')], wall(12, 'mm'))).toBe('accept');
    expect(result('api-1104', [corner(6, 'mm')], wall(12, 'mm'))).toBe('reject');
    expect(result('api-1104', [corner(0.2, 'in', { fusionRelated: true })], wall(0.5))).toBe('reject');
  });

  it('names the wall in the reason and requires a wall thickness', () => {
    const r = judge('api-1104', [surface(0.1)], wall(0.188));
    expect(r.specimens[0]?.reasons[0]?.message).toBe(
      'Discontinuity 1 (0.1 in) is larger than the largest single discontinuity allowed (measured 0.1 in, allowed 0.094 in, one-half the 0.188 in wall, which is smaller than 1/8 in).',
    );
    expect(() => judge('api-1104', [surface(0.1)])).toThrow(RulesInputError);
    try {
      judge('api-1104', []);
    } catch (e) {
      expect((e as RulesInputError).fields).toHaveProperty('wallThickness');
    }
  });
});

describe('iso-9606-1', () => {
  it('from memory: ISO 9606-1 bend test evaluation — 3 mm: at accepts, over rejects, under accepts', () => {
    expect(result('iso-9606-1', [surface(3, 'mm')])).toBe('accept');
    expect(result('iso-9606-1', [surface(3.05, 'mm')])).toBe('reject');
    expect(result('iso-9606-1', [surface(2.95, 'mm')])).toBe('accept');
  });

  it('from memory: ISO 9606-1 bend test evaluation — an inch measurement is judged on 3 mm converted (0.118 in), so 1/8 in rejects', () => {
    expect(result('iso-9606-1', [surface(0.118)])).toBe('accept');
    expect(result('iso-9606-1', [surface(0.125)])).toBe('reject');
  });

  it('from memory: ISO 9606-1 bend test evaluation — corner imperfections ignored unless lack of fusion or inclusions', () => {
    expect(result('iso-9606-1', [corner(8, 'mm')])).toBe('accept');
    expect(result('iso-9606-1', [corner(3.5, 'mm', { type: 'lack-of-fusion' })])).toBe('reject');
  });
});

describe('shop-general', () => {
  it('common practice (no source): a single discontinuity over 1/8 in rejects', () => {
    expect(result('shop-general', [surface(0.125)])).toBe('accept');
    expect(result('shop-general', [surface(0.126)])).toBe('reject');
  });

  it('common practice (no source): counted discontinuities may add up to 1/4 in on one specimen', () => {
    expect(result('shop-general', [surface(0.125), surface(0.125)])).toBe('accept');
    expect(result('shop-general', [surface(0.125), surface(0.1), surface(0.025)])).toBe('accept');
    expect(result('shop-general', [surface(0.125), surface(0.1), surface(0.0251)])).toBe('reject');
    expect(result('shop-general', [surface(0.1), surface(0.1), surface(0.05)])).toBe('accept');
  });

  it('common practice (no source): corner cracks ignored unless slag shows; over 1/4 in rejects regardless', () => {
    expect(result('shop-general', [corner(0.25)])).toBe('accept');
    expect(result('shop-general', [corner(0.26)])).toBe('reject');
    expect(result('shop-general', [corner(0.2, 'in', { type: 'slag' })])).toBe('reject');
    // an ignored corner crack does not count toward the sum
    expect(result('shop-general', [surface(0.125), surface(0.125), corner(0.2)])).toBe('accept');
  });

  it('common practice (no source): mm measurements are judged on 1/8 in converted (3.175 mm)', () => {
    expect(result('shop-general', [surface(3.1, 'mm')])).toBe('accept');
    expect(result('shop-general', [surface(3.2, 'mm')])).toBe('reject');
  });
});

describe('judging in the unit system of the measurement', () => {
  it('published: ASME IX QW-163 (read second-hand) — a 3.1 mm indication fails against 3 mm though it is under 1/8 in', () => {
    expect(result('asme-ix', [surface(3.1, 'mm')])).toBe('reject');
    expect(result('asme-ix', [surface(3.1 / 25.4)])).toBe('accept');
  });
});

describe('coupon result', () => {
  it('is the worst of its specimens: a replacement beats accept but not reject', () => {
    const r = evaluateBendTest({
      criteria: 'aws-d1.1',
      specimens: [
        { kind: 'face', discontinuities: [] },
        { kind: 'root', discontinuities: [corner(0.3)] },
      ],
    });
    expect(r.result).toBe('replace-specimen');
    const r2 = evaluateBendTest({
      criteria: 'aws-d1.1',
      specimens: [
        { kind: 'side', discontinuities: [corner(0.3)] },
        { kind: 'side', discontinuities: [surface(0.2)] },
      ],
    });
    expect(r2.result).toBe('reject');
    expect(r2.specimens.map((s) => s.result)).toEqual(['replace-specimen', 'reject']);
  });

  it('notes an ignored corner crack without counting it as a reason', () => {
    const r = judge('asme-ix', [corner(0.3)]);
    expect(r.specimens[0]?.reasons).toEqual([]);
    expect(r.specimens[0]?.notes[0]?.message).toMatch(/is not considered/);
  });
});

describe('custom criteria', () => {
  const custom: BendCriteria = {
    id: 'customer-x',
    name: 'Customer specification',
    clause: 'Customer spec 7.2',
    source: 'custom: set by the QA manager',
    single: { max: { mm: 2 } },
    cumulative: { max: { mm: 5 } },
    corner: { ignore: 'never' },
  };

  it('judges with a set of the same shape as the named ones', () => {
    expect(result(custom, [surface(2, 'mm')])).toBe('accept');
    expect(result(custom, [surface(2.1, 'mm')])).toBe('reject');
    expect(result(custom, [corner(2.1, 'mm')])).toBe('reject');
    expect(result(custom, [surface(2, 'mm'), surface(2, 'mm'), surface(1.5, 'mm')])).toBe('reject');
    expect(judge(custom, [surface(3, 'mm')]).specimens[0]?.reasons[0]?.clause).toBe('Customer spec 7.2');
  });

  it('every named set parses with the same schema as a custom set', () => {
    for (const c of Object.values(criteriaSets))
      expect(result(c, [surface(0.001)], { wallThickness: { value: 0.5, unit: 'in' } })).toBe('accept');
  });

  it('rejects a custom set with a missing limit, naming the field', () => {
    const bad = { ...custom, single: { max: {} } } as unknown as BendCriteria;
    try {
      result(bad, []);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(RulesInputError);
      expect(Object.keys((e as RulesInputError).fields)).toEqual(['criteria.single.max']);
    }
  });
});

describe('input validation', () => {
  it.each([
    [{ criteria: 'asme-ix', specimens: [] }, 'specimens'],
    [{ criteria: 'nope', specimens: [{ kind: 'face', discontinuities: [] }] }, 'criteria'],
    [{ criteria: 'asme-ix', specimens: [{ kind: 'bottom', discontinuities: [] }] }, 'specimens.0.kind'],
    [
      {
        criteria: 'asme-ix',
        specimens: [
          { kind: 'face', discontinuities: [{ size: { value: -1, unit: 'in' }, location: 'surface' }] },
        ],
      },
      'specimens.0.discontinuities.0.size.value',
    ],
    [
      {
        criteria: 'asme-ix',
        specimens: [
          { kind: 'face', discontinuities: [{ size: { value: 1, unit: 'ft' }, location: 'surface' }] },
        ],
      },
      'specimens.0.discontinuities.0.size.unit',
    ],
  ])('throws a RulesInputError naming the field (%#)', (input, field) => {
    expect(fieldsThrown(() => evaluateBendTest(input as unknown as BendTestInput))).toContain(field);
  });
});

// ---- properties -------------------------------------------------------------------------------------

const RANK: Record<BendResult, number> = { accept: 0, 'replace-specimen': 1, incomplete: 2, reject: 3 };
/** One test is recorded in one unit: every size of the generated specimens in the same one. */
const oneUnitOf = <S extends { discontinuities: D[] }>(specimens: S[], unit: 'in' | 'mm'): S[] =>
  specimens.map((s) => ({
    ...s,
    discontinuities: s.discontinuities.map((d) =>
      d.size.unit === unit
        ? d
        : { ...d, size: { value: unit === 'mm' ? d.size.value * 25.4 : d.size.value / 25.4, unit } },
    ),
  }));
const arbUnit = fc.constantFrom<'in' | 'mm'>('in', 'mm');
const arbDiscontinuity: fc.Arbitrary<D> = fc.record({
  size: fc.oneof(
    fc.record({ value: fc.double({ min: 0, max: 0.5, noNaN: true }), unit: fc.constant<'in'>('in') }),
    fc.record({ value: fc.double({ min: 0, max: 12, noNaN: true }), unit: fc.constant<'mm'>('mm') }),
  ),
  location: fc.constantFrom<'surface' | 'corner'>('surface', 'corner'),
  fusionRelated: fc.option(fc.boolean(), { nil: undefined }),
  type: fc.option(
    fc.constantFrom('crack', 'porosity', 'slag', 'lack-of-fusion', 'undercut', 'tear', 'other'),
    {
      nil: undefined,
    },
  ),
});
const arbSpecimen = fc.record({
  kind: fc.constantFrom<'face' | 'root' | 'side'>('face', 'root', 'side'),
  discontinuities: fc.array(arbDiscontinuity, { maxLength: 6 }),
});
const arbCriteria = fc.constantFrom(...(Object.keys(criteriaSets) as Array<keyof typeof criteriaSets>));
const arbWall = fc.record({
  value: fc.double({ min: 0.05, max: 2, noNaN: true }),
  unit: fc.constant<'in'>('in'),
});

describe('properties', () => {
  it('property: the coupon result is never better than any specimen’s', () => {
    fc.assert(
      fc.property(
        arbCriteria,
        fc.array(arbSpecimen, { minLength: 1, maxLength: 6 }),
        arbWall,
        arbUnit,
        (criteria, raw, wall, unit) => {
          const specimens = oneUnitOf(raw, unit);
          const r = evaluateBendTest({ criteria, specimens, wallThickness: wall });
          for (const s of r.specimens) expect(RANK[r.result]).toBeGreaterThanOrEqual(RANK[s.result]);
          const incomplete = r.completeness.length > 0 ? RANK.incomplete : 0;
          expect(RANK[r.result]).toBe(Math.max(incomplete, ...r.specimens.map((s) => RANK[s.result])));
          if (r.completeness.length > 0) expect(r.result).not.toBe('accept');
        },
      ),
    );
  });

  it('property: adding a discontinuity never turns reject into accept', () => {
    fc.assert(
      fc.property(
        arbCriteria,
        arbSpecimen,
        arbDiscontinuity,
        fc.nat(),
        arbWall,
        arbUnit,
        (criteria, rawSpecimen, rawExtra, at, wall, unit) => {
          const [specimen] = oneUnitOf([rawSpecimen], unit) as [typeof rawSpecimen];
          const [
            {
              discontinuities: [extra],
            },
          ] = oneUnitOf([{ discontinuities: [rawExtra] }], unit) as [{ discontinuities: [D] }];
          const before = evaluateBendTest({ criteria, specimens: [specimen], wallThickness: wall });
          fc.pre(before.result === 'reject');
          const ds = [...specimen.discontinuities];
          ds.splice(at % (ds.length + 1), 0, extra);
          const after = evaluateBendTest({
            criteria,
            specimens: [{ ...specimen, discontinuities: ds }],
            wallThickness: wall,
          });
          expect(after.result).toBe('reject');
        },
      ),
    );
  });

  it('property: every reject or replacement gives a clause and the measured and allowed size', () => {
    fc.assert(
      fc.property(
        arbCriteria,
        fc.array(arbSpecimen, { minLength: 1, maxLength: 4 }),
        arbWall,
        arbUnit,
        (criteria, raw, wall, unit) => {
          const r = evaluateBendTest({ criteria, specimens: oneUnitOf(raw, unit), wallThickness: wall });
          for (const s of r.specimens) {
            if (s.result === 'accept') expect(s.reasons).toEqual([]);
            else expect(s.reasons.length).toBeGreaterThan(0);
            for (const reason of s.reasons) {
              expect(reason.clause).toBe(criteriaSets[criteria].clause);
              expect(reason.message).toMatch(/measured .+ allowed /);
            }
          }
        },
      ),
    );
  });
});

// ---- issue 9, definite errors 1, 7 and 8 ------------------------------------------------------------

const clean = (kind: 'face' | 'root' | 'side') => ({ kind, discontinuities: [] as D[] });

describe('complete specimen sets (issue 9 error 1)', () => {
  it('common practice (no source); from memory: QW-302.3 — a face bend alone is never accepted, with or without the coupon', () => {
    const alone = evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('face')] });
    expect(alone.result).toBe('incomplete');
    expect(alone.completeness[0]?.message).toMatch(/face and root bends must both be present/);
    const withCoupon = evaluateBendTest({
      criteria: 'asme-ix',
      specimens: [clean('face')],
      coupon: {
        code: 'asme-ix',
        form: 'plate',
        position: '1G',
        depositedThickness: { value: 0.25, unit: 'in' },
      },
    });
    expect(withCoupon.result).toBe('incomplete');
    expect(withCoupon.completeness[0]?.clause).toBe('QW-452.1(a)');
  });

  it('common practice (no source) — face and side bends mixed are incomplete; a lone side bend too', () => {
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('face'), clean('side')] }).result).toBe(
      'incomplete',
    );
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('side')] }).result).toBe('incomplete');
    expect(
      evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('face'), clean('face'), clean('root')] })
        .result,
    ).toBe('incomplete');
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('side'), clean('side')] }).result).toBe(
      'accept',
    );
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: [clean('face'), clean('root')] }).result).toBe(
      'accept',
    );
  });

  it('published: ASME IX QW-452.1(a) (read second-hand) — a 5G or 6G coupon needs four bends, 2G + 5G six', () => {
    const pipe = (position: string) => ({
      code: 'asme-ix' as const,
      form: 'pipe' as const,
      position,
      depositedThickness: { value: 0.28, unit: 'in' as const },
    });
    const two = [clean('face'), clean('root')];
    const four = [...two, ...two];
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: two, coupon: pipe('5G') }).result).toBe(
      'incomplete',
    );
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: two, coupon: pipe('6G') }).result).toBe(
      'incomplete',
    );
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: four, coupon: pipe('6G') }).result).toBe(
      'accept',
    );
    expect(evaluateBendTest({ criteria: 'asme-ix', specimens: four, coupon: pipe('2G+5G') }).result).toBe(
      'incomplete',
    );
    expect(
      evaluateBendTest({ criteria: 'asme-ix', specimens: [...four, ...two], coupon: pipe('2G+5G') }).result,
    ).toBe('accept');
  });

  it('from memory: API 1104 welder specimen table (Table 3, 20th ed.) — face bends bent beside the two root bends of a wall up to 1/2 in do not make the set incomplete, and are judged', () => {
    const apiPipe = (od: number, wallIn: number) => ({
      code: 'api-1104' as const,
      form: 'pipe' as const,
      position: '5G',
      depositedThickness: { value: wallIn, unit: 'in' as const },
      thickness: { value: wallIn, unit: 'in' as const },
      outsideDiameter: { value: od, unit: 'in' as const },
    });
    const judge = (specimens: Parameters<typeof evaluateBendTest>[0]['specimens'], od = 8.625, w = 0.322) =>
      evaluateBendTest({ criteria: 'api-1104', wallThickness: { value: w, unit: 'in' }, specimens, coupon: apiPipe(od, w) });
    // OD over 4-1/2 in to 12-3/4 in, wall 1/2 in or less: two root bends
    expect(judge([clean('root'), clean('root')]).result).toBe('accept');
    expect(judge([clean('root'), clean('root'), clean('face'), clean('face')]).result).toBe('accept');
    expect(judge([clean('root'), clean('root'), { kind: 'face', discontinuities: [surface(0.2)] }]).result).toBe('reject');
    // still short without the root bends the table calls for
    expect(judge([clean('face'), clean('face')]).result).toBe('incomplete');
    // OD over 12-3/4 in: two root and two face; extra face bends are judged, not refused
    expect(judge([clean('root'), clean('root'), clean('face'), clean('face'), clean('face')], 16, 0.375).result).toBe('accept');
    expect(judge([clean('root'), clean('root'), clean('face')], 16, 0.375).result).toBe('incomplete');
    // ASME IX keeps refusing a mixed set
    expect(
      evaluateBendTest({
        criteria: 'asme-ix',
        specimens: [clean('face'), clean('root'), clean('side')],
        coupon: { code: 'asme-ix', form: 'plate', position: '1G', depositedThickness: { value: 0.25, unit: 'in' } },
      }).result,
    ).toBe('incomplete');
  });

  it('a rejecting specimen still rejects a short set (a fail is final)', () => {
    expect(
      evaluateBendTest({
        criteria: 'asme-ix',
        specimens: [{ kind: 'face', discontinuities: [surface(0.2)] }],
      }).result,
    ).toBe('reject');
  });
});

describe('corner discontinuities with an internal cause (issue 9 error 7)', () => {
  it('published: ASME IX QW-163 (read second-hand) — corner porosity is an internal discontinuity and counts', () => {
    expect(result('asme-ix', [corner(0.2, 'in', { type: 'porosity' })])).toBe('reject');
    expect(result('asme-ix', [corner(0.2, 'in', { type: 'crack' })])).toBe('accept');
  });

  it('from memory: API 1104 bend test acceptance — an obvious imperfection at the corner (porosity, undercut) is judged', () => {
    const wall = { wallThickness: { value: 0.5, unit: 'in' as const } };
    expect(result('api-1104', [corner(0.2, 'in', { type: 'porosity' })], wall)).toBe('reject');
    expect(result('api-1104', [corner(0.2, 'in', { type: 'undercut' })], wall)).toBe('reject');
    expect(result('api-1104', [corner(0.2, 'in', { type: 'crack' })], wall)).toBe('accept');
  });
});

describe('one unit system per test (issue 9 error 8)', () => {
  it('common practice (no source) — mixed inches and millimetres on one test are refused, naming the field', () => {
    const input: BendTestInput = {
      criteria: 'aws-d1.1',
      specimens: [
        { kind: 'face', discontinuities: [surface(3, 'mm'), surface(3, 'mm')] },
        { kind: 'root', discontinuities: [surface(0.06)] },
      ],
    };
    expect(fieldsThrown(() => evaluateBendTest(input))).toEqual(['specimens.1.discontinuities.0.size.unit']);
    try {
      evaluateBendTest(input);
    } catch (e) {
      expect((e as RulesInputError).message).toMatch(
        /recorded in millimetres .* enter every size on one test in mm/,
      );
    }
  });

  it('from memory: AWS D1.1 4.9.3.3 (2015) — the 1/32 in floor applies in inches, 1 mm in millimetres', () => {
    // 0.035 in is over 1/32 in and counts; 0.9 mm is under 1 mm and does not
    expect(result('aws-d1.1', [surface(0.125), surface(0.125), surface(0.125), surface(0.035)])).toBe(
      'reject',
    );
    expect(
      result('aws-d1.1', [surface(3, 'mm'), surface(3, 'mm'), surface(3, 'mm'), surface(0.9, 'mm')]),
    ).toBe('accept');
  });
});
