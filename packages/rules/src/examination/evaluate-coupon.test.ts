// Worked examples of a coupon's whole examination, one or more per kind. Each check value names its source.
import { describe, expect, it } from 'vitest';
import { type CouponInput } from '../schemas/coupon.js';
import { type CouponEvaluationInput } from '../schemas/examination.js';
import { fieldsThrown } from '../test-support/fields-thrown.js';
import { evaluateCoupon } from './evaluate-coupon.js';
import { retestOptions, retestSetVerdict } from './retests.js';

const inch = (value: number) => ({ value, unit: 'in' as const });
const mm = (value: number) => ({ value, unit: 'mm' as const });
const clean = (kind: 'face' | 'root' | 'side', id?: string) => ({
  ...(id ? { id } : {}),
  kind,
  discontinuities: [],
});
const crack = (value: number, unit: 'in' | 'mm' = 'in') => ({
  size: { value, unit },
  location: 'surface' as const,
  type: 'crack' as const,
});

const asmePlate = (more: Partial<CouponInput> = {}): CouponInput => ({
  code: 'asme-ix',
  process: 'SMAW',
  form: 'plate',
  weld: 'groove',
  position: '1G',
  thickness: inch(0.375),
  depositedThickness: inch(0.25),
  backing: true,
  fNumber: 4,
  ...more,
});
const ok = { result: 'accept' as const };
/** API 1104, SMAW downhill, 1/4 in wall. */
const apiPipe = (position: string, od: number): CouponInput => ({
  code: 'api-1104',
  process: 'SMAW',
  form: 'pipe',
  weld: 'groove',
  position,
  thickness: inch(0.25),
  outsideDiameter: inch(od),
  backing: false,
  fNumber: 3,
  progression: 'downhill',
});
const input = (more: Partial<CouponEvaluationInput> = {}): CouponEvaluationInput => ({
  coupon: asmePlate(),
  visual: ok,
  bend: { specimens: [clean('face', 'F1'), clean('root', 'R1')] },
  ...more,
});

describe('visual examination first', () => {
  it('from memory: ASME IX QW-302.4, QW-194 — a visual reject stops the examination (no bend part is judged)', () => {
    const e = evaluateCoupon(input({ visual: { result: 'accept', findings: [{ type: 'crack' }] } }));
    expect(e.result).toBe('reject');
    expect(e.parts.map((p) => p.kind)).toEqual(['visual']);
    expect(e.reasons[0]?.clause).toBe('QW-302.4, QW-194');
  });

  it('from memory: AWS D1.1-2015 4.9.1 — undercut over 1/32 in rejects; 1/32 in exactly accepts; an unmeasured one is incomplete', () => {
    const aws = (size?: { value: number; unit: 'in' | 'mm' }) =>
      evaluateCoupon(
        input({
          coupon: asmePlate({ code: 'aws-d1.1', thickness: inch(0.375), depositedThickness: undefined }),
          visual: { result: 'accept', findings: [{ type: 'undercut', ...(size ? { size } : {}) }] },
        }),
      ).parts[0]?.result;
    expect(aws(inch(1 / 32))).toBe('accept');
    expect(aws(inch(0.04))).toBe('reject');
    expect(aws(mm(1))).toBe('accept');
    expect(aws(mm(1.1))).toBe('reject');
    expect(aws()).toBe('incomplete');
  });

  it("the examiner's visual reject rejects", () => {
    expect(evaluateCoupon(input({ visual: { result: 'reject' } })).result).toBe('reject');
  });
});

describe('guided bends judged by the code, an in-house set only in addition (issue 9 error 9)', () => {
  it('published: ASME IX QW-163 (read second-hand) — a complete clean set accepts and names the code criteria', () => {
    const e = evaluateCoupon(input());
    expect(e.result).toBe('accept');
    expect(e.codeCriteria.id).toBe('asme-ix');
    expect(e.additionalCriteria).toBeNull();
    expect(e.parts.map((p) => p.kind)).toEqual(['visual', 'bend']);
  });

  it('common practice (no source) — shop criteria are applied in addition: stricter where they are, never instead', () => {
    // 3/32 + 3/32 + 3/32 = 9/32 in: within QW-163 (no sum) but over the shop's 1/4 in total
    const d = (v: number) => ({ size: inch(v), location: 'surface' as const });
    const e = evaluateCoupon(
      input({
        additionalCriteria: 'shop-general',
        bend: {
          specimens: [{ kind: 'face', discontinuities: [d(3 / 32), d(3 / 32), d(3 / 32)] }, clean('root')],
        },
      }),
    );
    expect(e.result).toBe('reject');
    expect(e.codeCriteria.id).toBe('asme-ix');
    expect(e.additionalCriteria?.id).toBe('shop-general');
    expect(e.parts[1]?.criteria.map((c) => c.id)).toEqual(['asme-ix', 'shop-general']);
    // a 5/32 in crack rejects under QW-163 whatever the in-house set says
    const looser = { ...evaluateCouponCriteria(), id: 'loose', single: { max: { in: 1 } } };
    expect(
      evaluateCoupon(
        input({
          additionalCriteria: looser,
          bend: { specimens: [{ kind: 'face', discontinuities: [crack(5 / 32)] }, clean('root')] },
        }),
      ).result,
    ).toBe('reject');
  });

  it('published: ASME IX QW-452.1(a) (read second-hand) — a 6G coupon on two specimens is incomplete', () => {
    const e = evaluateCoupon(
      input({
        coupon: asmePlate({
          form: 'pipe',
          position: '6G',
          outsideDiameter: inch(6.625),
          thickness: inch(0.28),
          depositedThickness: undefined,
          progression: 'uphill',
        }),
      }),
    );
    expect(e.result).toBe('incomplete');
    expect(e.reasons.at(-1)?.clause).toBe('QW-452.1(a)');
  });

  it('refuses mixed units on one bend test, naming the field (issue 9 error 8)', () => {
    expect(
      fieldsThrown(() =>
        evaluateCoupon(
          input({
            bend: {
              specimens: [
                { kind: 'face', discontinuities: [{ size: mm(1), location: 'surface' }] },
                { kind: 'root', discontinuities: [{ size: inch(0.05), location: 'surface' }] },
              ],
            },
          }),
        ),
      ),
    ).toEqual(['bend.specimens.1.discontinuities.0.size.unit']);
  });

  it('nothing recorded beyond the visual examination is incomplete, never accept', () => {
    const e = evaluateCoupon({ coupon: asmePlate(), visual: ok });
    expect(e.result).toBe('incomplete');
  });
});

function evaluateCouponCriteria() {
  return {
    id: 'x',
    name: 'In-house',
    clause: 'Shop manual 4.2',
    source: 'common practice (no source)',
    single: { max: { in: 1 / 8 } },
    corner: { ignore: 'unless-fusion-related' as const },
  };
}

describe('radiography or ultrasonics in place of bends', () => {
  const rt = (
    indications: CouponEvaluationInput['volumetric'] extends infer V
      ? V extends { indications: infer I }
        ? I
        : never
      : never,
    more: Partial<CouponEvaluationInput> = {},
  ) =>
    evaluateCoupon({
      coupon: asmePlate({ thickness: inch(0.375), depositedThickness: undefined }),
      visual: ok,
      volumetric: { method: 'radiography', indications },
      ...more,
    });

  it('from memory: ASME IX QW-191.1.2.2 — t = 3/8 in: slag up to 1/8 in accepts, longer rejects; any crack rejects; rounded up to 20 % of t or 1/8 in', () => {
    expect(rt([{ type: 'elongated-slag', size: inch(0.125) }]).result).toBe('accept');
    expect(rt([{ type: 'elongated-slag', size: inch(0.13) }]).result).toBe('reject');
    expect(rt([{ type: 'crack', size: inch(0.02) }]).result).toBe('reject');
    // 20 % of 0.375 in = 0.075 in, smaller than 1/8 in
    expect(rt([{ type: 'rounded', size: inch(0.075) }]).result).toBe('accept');
    expect(rt([{ type: 'rounded', size: inch(0.08) }]).result).toBe('reject');
    expect(rt([]).parts.map((p) => p.kind)).toEqual(['visual', 'radiography']);
  });

  it('from memory: ASME IX QW-191.1.2.2 — t = 1 in: elongated indications up to t/3', () => {
    const thick = { coupon: asmePlate({ thickness: inch(1), depositedThickness: inch(1), layers: 4 }) };
    expect(rt([{ type: 'elongated-slag', size: inch(0.5) }], thick).result).toBe('reject');
    expect(rt([{ type: 'elongated-slag', size: inch(0.33) }], thick).result).toBe('accept');
  });

  it('from memory: ASME IX QW-304 — GMAW short-circuit cannot be qualified by radiography: the bends are still called for', () => {
    const e = rt([], {
      coupon: asmePlate({
        process: 'GMAW',
        transferMode: 'short-circuit',
        fNumber: 6,
        depositedThickness: undefined,
      }),
    });
    expect(e.result).toBe('incomplete');
    expect(e.reasons[0]?.clause).toBe('QW-304');
  });

  it('from memory: API 1104 9.3 — elongated slag up to 2 in long and 1/16 in wide; a pore over 1/8 in or 25 % of the wall rejects', () => {
    const api = (indications: Parameters<typeof rt>[0]) =>
      evaluateCoupon({
        coupon: apiPipe('6G', 8.625),
        visual: ok,
        volumetric: { method: 'radiography', indications },
      }).result;
    expect(api([{ type: 'elongated-slag', size: inch(2), width: inch(1 / 16) }])).toBe('accept');
    expect(api([{ type: 'elongated-slag', size: inch(2.1) }])).toBe('reject');
    expect(api([{ type: 'elongated-slag', size: inch(1), width: inch(0.07) }])).toBe('reject');
    // 25 % of 0.25 in = 1/16 in, smaller than 1/8 in
    expect(api([{ type: 'rounded', size: inch(1 / 16) }])).toBe('accept');
    expect(api([{ type: 'rounded', size: inch(0.07) }])).toBe('reject');
  });

  it('an indication the rules do not size is left to the report: without its verdict the part is incomplete', () => {
    expect(rt([{ type: 'burn-through', size: inch(0.1) }]).result).toBe('incomplete');
    expect(
      rt([{ type: 'burn-through', size: inch(0.1) }], {
        volumetric: {
          method: 'radiography',
          indications: [{ type: 'burn-through', size: inch(0.1) }],
          examinerResult: 'accept',
        },
      }).result,
    ).toBe('accept');
  });
});

describe('fillet weld break and macro-etch', () => {
  const fillet = (code: CouponInput['code'], more: Partial<CouponEvaluationInput> = {}) =>
    evaluateCoupon({
      coupon: {
        code,
        process: 'SMAW',
        form: 'plate',
        weld: 'fillet',
        position: '2F',
        thickness: inch(0.375),
        backing: false,
        fNumber: 4,
      },
      visual: ok,
      ...more,
    });

  it('from memory: ASME IX QW-182, QW-184 — inclusions adding up to 3/8 in accept, more rejects; legs differing over 1/8 in reject', () => {
    const macro = {
      completeFusion: true,
      legs: [inch(0.375), inch(0.5)] as [ReturnType<typeof inch>, ReturnType<typeof inch>],
    };
    expect(
      fillet('asme-ix', {
        filletBreak: { bentFlat: false, inclusions: [inch(0.25), inch(0.125)] },
        macroEtch: macro,
      }).result,
    ).toBe('accept');
    expect(
      fillet('asme-ix', {
        filletBreak: { bentFlat: false, inclusions: [inch(0.25), inch(0.13)] },
        macroEtch: macro,
      }).result,
    ).toBe('reject');
    expect(
      fillet('asme-ix', {
        filletBreak: { bentFlat: true },
        macroEtch: { completeFusion: true, legs: [inch(0.375), inch(0.51)] },
      }).result,
    ).toBe('reject');
    expect(fillet('asme-ix', { filletBreak: { bentFlat: true } }).result).toBe('incomplete');
  });

  it('from memory: AWS D1.1-2015 4.30.4.1 — no inclusion over 3/32 in; root fusion incomplete rejects', () => {
    const macro = { completeFusion: true };
    expect(
      fillet('aws-d1.1', { filletBreak: { bentFlat: false, inclusions: [inch(3 / 32)] }, macroEtch: macro })
        .result,
    ).toBe('accept');
    expect(
      fillet('aws-d1.1', { filletBreak: { bentFlat: false, inclusions: [inch(0.1)] }, macroEtch: macro })
        .result,
    ).toBe('reject');
    expect(
      fillet('aws-d1.1', { filletBreak: { bentFlat: false, incompleteRootFusion: true }, macroEtch: macro })
        .result,
    ).toBe('reject');
  });
});

describe('API 1104 nick-break', () => {
  const api = (more: Partial<CouponEvaluationInput>) =>
    evaluateCoupon({
      coupon: apiPipe('6G', 6.625),
      visual: ok,
      bend: { specimens: [clean('root'), clean('root')] },
      ...more,
    });
  const nb = (more = {}) => ({ completePenetrationAndFusion: true, ...more });

  it('from memory: API 1104 welder specimen table — OD 6.625 in, wall 1/4 in: two nick-breaks and two root bends', () => {
    expect(api({ nickBreak: { specimens: [nb(), nb()] } }).result).toBe('accept');
    expect(api({ nickBreak: { specimens: [nb()] } }).result).toBe('incomplete');
    expect(api({}).result).toBe('incomplete');
  });

  it('from memory: API 1104 nick-break — a gas pocket over 1/16 in, slag over 1/32 in deep or over half the wall long rejects', () => {
    expect(api({ nickBreak: { specimens: [nb({ gasPockets: [inch(1 / 16)] }), nb()] } }).result).toBe(
      'accept',
    );
    expect(api({ nickBreak: { specimens: [nb({ gasPockets: [inch(0.07)] }), nb()] } }).result).toBe('reject');
    expect(api({ nickBreak: { specimens: [nb({ gasPocketAreaPercent: 2.5 }), nb()] } }).result).toBe(
      'reject',
    );
    expect(
      api({
        nickBreak: { specimens: [nb({ slagInclusions: [{ depth: inch(0.04), length: inch(0.1) }] }), nb()] },
      }).result,
    ).toBe('reject');
    // half of the 1/4 in wall is 1/8 in: the 1/8 in length limit and half the wall agree
    expect(
      api({
        nickBreak: {
          specimens: [nb({ slagInclusions: [{ depth: inch(1 / 32), length: inch(1 / 8) }] }), nb()],
        },
      }).result,
    ).toBe('accept');
    expect(
      api({ nickBreak: { specimens: [nb({ completePenetrationAndFusion: false }), nb()] } }).result,
    ).toBe('reject');
  });
});

describe('combination coupons (QW-306)', () => {
  it('from memory: ASME IX QW-306 — GTAW root and SMAW fill: each qualifies its own deposit; one failure fails both', () => {
    const coupon = asmePlate({
      process: 'GTAW',
      thickness: inch(0.75),
      depositedThickness: inch(0.125),
      fNumber: 6,
      backing: false,
    });
    const layers = [
      { process: 'GTAW' as const, depositedThickness: inch(0.125), fNumber: 6 },
      { process: 'SMAW' as const, depositedThickness: inch(0.625), fNumber: 4, layers: 5 },
    ];
    const sides = { specimens: [clean('side'), clean('side')] };
    const e = evaluateCoupon({ coupon, visual: ok, bend: sides, layers });
    expect(e.result).toBe('accept');
    const combo = e.parts.find((p) => p.kind === 'combination');
    expect(combo?.items?.map((i) => i.reasons[0]?.message)).toEqual([
      'GTAW deposited 1/8 in: qualifies deposited weld metal up to 1/4 in with GTAW (QW-452.1(b), QW-404.30).',
      'SMAW deposited 5/8 in: qualifies deposited weld metal with no upper limit with SMAW (QW-452.1(b)).',
    ]);
    const failed = evaluateCoupon({
      coupon,
      visual: ok,
      bend: { specimens: [{ kind: 'side', discontinuities: [crack(0.2)] }, clean('side')] },
      layers,
    });
    expect(failed.result).toBe('reject');
    expect(failed.parts.find((p) => p.kind === 'combination')?.items?.map((i) => i.result)).toEqual([
      'reject',
      'reject',
    ]);
  });
});

describe('retests linked to the failed test', () => {
  const retest = (code: CouponInput['code'], r: NonNullable<CouponEvaluationInput['retest']>, extra = {}) =>
    evaluateCoupon(
      input({
        coupon: code === 'asme-ix' ? asmePlate() : asmePlate({ code, depositedThickness: undefined }),
        retest: r,
        ...extra,
      }),
    );

  it('from memory: ASME IX QW-321.2 — an immediate retest is two consecutive coupons, all passing; the first of the pair is a passing coupon awaiting the second', () => {
    const first = retest('asme-ix', { of: 'C-101', basis: 'immediate' });
    expect(first.result).toBe('accept');
    expect(first.retest).toMatchObject({ result: 'awaiting', needed: 2, recorded: 1, clause: 'QW-321.2' });
    const second = retest('asme-ix', { of: 'C-101', basis: 'immediate', companions: ['accept'] });
    expect(second.result).toBe('accept');
    expect(second.retest).toMatchObject({ result: 'accept', needed: 2, recorded: 2 });
    // the second coupon passes its own examination, but the retest fails with the first
    const afterFail = retest('asme-ix', { of: 'C-101', basis: 'immediate', companions: ['reject'] });
    expect(afterFail.result).toBe('accept');
    expect(afterFail.retest?.result).toBe('reject');
    expect(afterFail.retest?.message).toMatch(/QW-321\.4/);
  });

  it('from memory: ASME IX QW-321.2 — a failing coupon of the pair fails the retest', () => {
    const failing = retest(
      'asme-ix',
      { of: 'C-101', basis: 'immediate', companions: ['accept'] },
      { bend: { specimens: [{ kind: 'face', discontinuities: [crack(0.2)] }, clean('root')] } },
    );
    expect(failing.result).toBe('reject');
    expect(failing.retest?.result).toBe('reject');
  });

  it('from memory: ASME IX QW-321.3 — an immediate retest after a failed radiograph is radiographed too', () => {
    const bent = retest('asme-ix', { of: 'C-101', basis: 'immediate', failedKind: 'volumetric' });
    expect(bent.result).toBe('incomplete');
    expect(bent.parts.at(-1)?.reasons[0]?.clause).toBe('QW-321.3');
    expect(retest('asme-ix', { of: 'C-101', basis: 'after-training', failedKind: 'volumetric' }).result).toBe('accept');
  });

  it('from memory: ASME IX QW-321.4 — after further training, one new test', () => {
    const e = retest('asme-ix', { of: 'C-101', basis: 'after-training' });
    expect(e.result).toBe('accept');
    expect(e.retest).toMatchObject({ result: 'accept', needed: 1, recorded: 1, clause: 'QW-321.4' });
    expect(e.parts.at(-1)?.notes[0]?.message).toMatch(/Retest of C-101/);
  });

  it('from memory: AWS D1.1-2015 4.24.1.1 — an immediate retest is two welds of the type failed', () => {
    const e = retest('aws-d1.1', { of: 'C-9', basis: 'immediate' });
    expect(e.retest).toMatchObject({ result: 'awaiting', needed: 2, clause: 'AWS D1.1 4.24.1.1 (2015)' });
    expect(retestOptions('aws-d1.1').map((o) => [o.basis, o.coupons, o.clause])).toEqual([
      ['immediate', 2, 'AWS D1.1 4.24.1.1 (2015)'],
      ['after-training', 1, 'AWS D1.1 4.24.1.2 (2015)'],
    ]);
  });

  it('from memory: API 1104 6.7 — one second opportunity, then only after documented training', () => {
    const api = (r: NonNullable<CouponEvaluationInput['retest']>) =>
      evaluateCoupon({
        coupon: apiPipe('5G', 6.625),
        visual: ok,
        volumetric: { method: 'radiography', indications: [] },
        retest: r,
      });
    expect(api({ of: 'C-7', basis: 'immediate' }).result).toBe('accept');
    expect(api({ of: 'C-7', basis: 'immediate' }).retest).toMatchObject({ result: 'accept', needed: 1 });
    expect(api({ of: 'C-7', basis: 'immediate', priorRetests: 1 }).result).toBe('incomplete');
    expect(api({ of: 'C-7', basis: 'after-training', priorRetests: 1 }).result).toBe('accept');
  });

  it('common practice (no source): a retest set is judged from every coupon recorded as it', () => {
    expect(retestSetVerdict('asme-ix', 'immediate', ['accept']).result).toBe('awaiting');
    expect(retestSetVerdict('asme-ix', 'immediate', ['accept', 'accept']).result).toBe('accept');
    expect(retestSetVerdict('asme-ix', 'immediate', ['accept', 'replace-specimen']).result).toBe('awaiting');
    expect(retestSetVerdict('asme-ix', 'immediate', ['reject']).result).toBe('reject');
    expect(retestSetVerdict('asme-ix', 'after-training', ['accept']).result).toBe('accept');
  });
});
