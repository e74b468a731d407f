// A coupon's whole examination as one verdict (TRADE.md §8): visual first (a reject stops there), then the
// examination the code calls for — bends, radiography or ultrasonics in their place, fillet break and
// macro-etch, API 1104 nick-breaks — each judged by the coupon code's own criteria, an in-house set only in
// addition. A coupon passes only when every part the code calls for is there and passes.
import {
  bendSetCompleteness,
  checkOneUnit,
  evaluateBendTest,
  RESULT_RANK,
} from '../bend/evaluate-bend-test.js';
import { criteriaSets } from '../bend/criteria-sets.js';
import { api1104Specimens } from '../bend/propose-specimens.js';
import { type BendCriteria } from '../schemas/bend.js';
import { type CodeId } from '../schemas/common.js';
import { type Coupon } from '../schemas/coupon.js';
import {
  couponEvaluationInputSchema,
  type CouponEvaluation,
  type CouponEvaluationInput,
  type CouponResult,
  type CriteriaRef,
  type EvaluationPart,
  type ExaminationKind,
} from '../schemas/examination.js';
import { isFilletTest } from '../ranges/positions.js';
import { qualifiedRanges, RANGES_NOTICE } from '../ranges/qualified-ranges.js';
import { formatLength } from '../units/length.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { RULES_VERSION } from '../version.js';
import {
  FILLET_BREAK,
  MACRO,
  judgeFilletBreak,
  judgeMacro,
  judgeNickBreakSpecimen,
  judgeVisual,
  judgeVolumetric,
  NICK_BREAK,
  volumetricRule,
  type PartVerdict,
  type Reason,
} from './judges.js';
import { couponPerProcess } from './combination.js';
import { RETEST_RULES, retestVerdict, type RetestSetVerdict } from './retests.js';

type Parsed = ReturnType<typeof parse>;
const parse = (input: CouponEvaluationInput) => parseInput(couponEvaluationInputSchema, input);

const worst = (results: CouponResult[]): CouponResult =>
  results.reduce<CouponResult>((a, b) => (RESULT_RANK[b] > RESULT_RANK[a] ? b : a), 'accept');

const refOf = (c: { id: string; name: string; clause: string; source: string }): CriteriaRef => ({
  id: c.id,
  name: c.name,
  clause: c.clause,
  source: c.source,
});

const part = (
  kind: ExaminationKind,
  v: PartVerdict | { result: CouponResult; reasons: Reason[]; notes: Reason[] },
  criteria: CriteriaRef[],
  items?: EvaluationPart['items'],
): EvaluationPart => ({
  kind,
  result: v.result,
  criteria,
  reasons: v.reasons,
  notes: v.notes,
  ...(items ? { items } : {}),
});

const missing = (
  kind: ExaminationKind,
  clause: string,
  message: string,
  criteria: CriteriaRef[],
): EvaluationPart =>
  part(kind, { result: 'incomplete', reasons: [{ clause, message }], notes: [] }, criteria);

/** Re-key a rules error under the part of the input it came from. */
function under<T>(prefix: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof RulesInputError)
      throw new RulesInputError(
        Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [k ? `${prefix}.${k}` : prefix, v])),
      );
    throw err;
  }
}

// Where a code does not let radiography or ultrasonics replace the bends (from memory; see README).
function volumetricProblem(
  code: CodeId,
  c: Coupon,
  processes: Parsed['layers'],
  method: 'radiography' | 'ultrasonic',
): Reason | null {
  const all = processes ?? [{ process: c.process, transferMode: c.transferMode }];
  const shortCircuit = all.some(
    (l) => l.process === 'GMAW' && (l.transferMode ?? c.transferMode) === 'short-circuit',
  );
  if (code === 'asme-ix' && shortCircuit)
    return {
      clause: 'QW-304',
      message:
        'Under ASME IX a welder using GMAW short-circuit transfer is qualified by bend tests only: radiography or ultrasonics cannot replace them. Add the bend specimens.',
    };
  if (code === 'aws-d1.1' && shortCircuit)
    return {
      clause: 'AWS D1.1 4.22 (2015) welder qualification tests',
      message:
        'Under AWS D1.1 radiography may not be used to qualify a welder with GMAW-S: add the bend specimens.',
    };
  if (code === 'aws-d1.1' && method === 'ultrasonic')
    return {
      clause: 'AWS D1.1 4.22 (2015) welder qualification tests',
      message:
        'AWS D1.1 (2015) qualifies welders by bend tests or radiography, not by ultrasonics: add the bend specimens or a radiograph.',
    };
  if (code === 'iso-9606-1' && all.some((l) => l.process === 'GMAW' || l.process === 'OFW'))
    return {
      clause: 'ISO 9606-1 examination and testing (additional bend or fracture tests)',
      message:
        'Under ISO 9606-1 a radiographed coupon welded with solid-wire GMAW (131/135) or oxyfuel (311) also needs bend or fracture tests: add the bend specimens.',
    };
  return null;
}

function bendPart(
  p: Parsed,
  code: BendCriteria,
  additional: BendCriteria | null,
  criteria: CriteriaRef[],
): EvaluationPart {
  const c = p.coupon;
  const specimens = p.bend?.specimens ?? [];
  under('bend', () => checkOneUnit(specimens));
  const couponContext = {
    code: c.code,
    form: c.form,
    position: c.position,
    // a combination coupon's specimens are cut from the whole coupon, all processes together
    depositedThickness: p.layers ? c.thickness : (c.depositedThickness ?? c.thickness),
    thickness: c.thickness,
    ...(c.outsideDiameter ? { outsideDiameter: c.outsideDiameter } : {}),
  };
  const judge = (set: BendCriteria) =>
    under('bend', () => evaluateBendTest({ criteria: set, wallThickness: c.thickness, specimens }));
  const byCode = judge(code);
  const byExtra = additional ? judge(additional) : null;
  const completeness = under('coupon', () => bendSetCompleteness(specimens, couponContext));
  const items = byCode.specimens.map((s, i) => {
    const extra = byExtra?.specimens[i];
    return {
      ...(s.id !== undefined ? { id: s.id } : {}),
      kind: s.kind,
      result: worst([s.result, extra?.result ?? 'accept']),
      reasons: [
        ...s.reasons,
        ...(extra?.reasons ?? []).map((r) => ({
          clause: r.clause,
          message: `${r.message} (in-house criteria, in addition to the code's)`,
        })),
      ],
    };
  });
  const label = (id: string | undefined, kind: string, i: number) => `${id ?? `Specimen ${i + 1}`} (${kind})`;
  const reasons = [
    ...items.flatMap((s, i) =>
      s.reasons.map((r) => ({ clause: r.clause, message: `${label(s.id, s.kind, i)}: ${r.message}` })),
    ),
    ...completeness,
  ];
  const notes = byCode.specimens.flatMap((s, i) =>
    s.notes.map((r) => ({ clause: r.clause, message: `${label(s.id, s.kind, i)}: ${r.message}` })),
  );
  const result = worst([...items.map((s) => s.result), completeness.length > 0 ? 'incomplete' : 'accept']);
  return part('bend', { result, reasons, notes }, criteria, items);
}

function nickBreakPart(p: Parsed): EvaluationPart {
  const c = p.coupon;
  const ref: CriteriaRef = {
    id: 'api-1104-nick-break',
    name: 'API 1104 nick-break',
    clause: NICK_BREAK.clause,
    source: NICK_BREAK.source,
  };
  const specimens = p.nickBreak?.specimens ?? [];
  const items = specimens.map((s, i) => {
    const v = judgeNickBreakSpecimen(s, c.thickness, `nickBreak.specimens.${i}`);
    return { ...(s.id ? { id: s.id } : {}), kind: 'nick-break', result: v.result, reasons: v.reasons };
  });
  const reasons = items.flatMap((s, i) =>
    s.reasons.map((r) => ({ clause: r.clause, message: `${s.id ?? `Nick-break ${i + 1}`}: ${r.message}` })),
  );
  let result = worst(items.map((s) => s.result));
  if (c.outsideDiameter) {
    const { counts, band } = api1104Specimens(c.outsideDiameter, c.thickness);
    if (specimens.length < counts.nickBreak) {
      result = worst([result, 'incomplete']);
      reasons.push({
        clause: 'API 1104 welder qualification specimens',
        message: `${band}: ${counts.nickBreak} nick-break specimens are called for; ${specimens.length} recorded.`,
      });
    }
  }
  return part('nick-break', { result, reasons, notes: [] }, [ref], items);
}

function combinationPart(p: Parsed, layers: NonNullable<Parsed['layers']>): EvaluationPart {
  const c = p.coupon;
  const clause = 'QW-306';
  // each process with the weld metal it deposited, as certification issues its qualification
  const items = couponPerProcess(c, layers).map((one, i) =>
    under(`layers.${i}`, () => {
      const r = qualifiedRanges(one);
      const deposited = one.depositedThickness ?? one.thickness;
      const max = r.thickness.max ? `up to ${formatLength(r.thickness.max)}` : 'with no upper limit';
      const pending: CouponResult = 'accept'; // set to the coupon's verdict once every part is judged
      return {
        kind: one.process,
        result: pending,
        reasons: [
          {
            clause,
            message: `${one.process} deposited ${formatLength(deposited)}: qualifies deposited weld metal ${max} with ${one.process} (${r.limits.find((x) => x.variable === 'thickness')?.clause ?? ''}).`,
          },
        ],
      };
    }),
  );
  return part(
    'combination',
    {
      result: 'accept',
      reasons: [],
      notes: [
        {
          clause,
          message: `Combination coupon (${layers.map((l) => l.process).join(' + ')}): each process qualifies its own deposited thickness, and a failure of any part of the examination fails every process of the coupon.`,
        },
      ],
    },
    [
      {
        id: 'asme-ix-qw-306',
        name: 'Combination of welding processes',
        clause,
        source: 'from memory: ASME IX QW-306',
      },
    ],
    items,
  );
}

/** The whole examination of a coupon, judged by its code's criteria (an in-house set only in addition). */
export function evaluateCoupon(input: CouponEvaluationInput): CouponEvaluation {
  const p = parse(input);
  const c = p.coupon;
  const code = c.code;
  const codeSet = criteriaSets[code];
  const extraRaw = p.additionalCriteria;
  const extra =
    extraRaw === undefined ? null : typeof extraRaw === 'string' ? criteriaSets[extraRaw] : extraRaw;
  const additional = extra && extra.id !== codeSet.id ? extra : null;
  // the coupon must be one the rules can give ranges for (its variables are consistent)
  under('coupon', () => qualifiedRanges(c));

  const parts: EvaluationPart[] = [];
  const visual = judgeVisual(code, p.visual);
  parts.push(
    part('visual', visual, [
      { id: `${code}-visual`, name: 'Visual examination', clause: visual.clause, source: visual.source },
    ]),
  );

  if (visual.result !== 'reject') {
    const bendCriteria = [refOf(codeSet), ...(additional ? [refOf(additional)] : [])];
    const fillet = c.weld === 'fillet' || isFilletTest(c.position);
    if (fillet) {
      const needBreak = code !== 'iso-9606-1' && !(code === 'asme-ix' && c.form === 'pipe');
      const needMacro = code === 'asme-ix' || code === 'aws-d1.1';
      const breakRef = {
        id: `${code}-fillet-break`,
        name: 'Fillet weld break',
        clause: FILLET_BREAK[code].clause,
        source: FILLET_BREAK[code].source,
      };
      const macroRef = {
        id: `${code}-macro-etch`,
        name: 'Macro-etch',
        clause: MACRO[code].clause,
        source: MACRO[code].source,
      };
      if (p.filletBreak) {
        const v = under('filletBreak', () => judgeFilletBreak(code, p.filletBreak!, c.thickness));
        parts.push(part('fillet-break', v, [breakRef]));
      } else if (needBreak || (code === 'iso-9606-1' && !p.macroEtch))
        parts.push(
          missing('fillet-break', breakRef.clause, 'Record the fillet weld break test.', [breakRef]),
        );
      if (p.macroEtch)
        parts.push(
          part(
            'macro-etch',
            under('macroEtch', () => judgeMacro(code, p.macroEtch!)),
            [macroRef],
          ),
        );
      else if (needMacro)
        parts.push(missing('macro-etch', macroRef.clause, 'Record the macro-etch examination.', [macroRef]));
    } else {
      const vol = p.volumetric;
      const volProblem = vol ? volumetricProblem(code, c, p.layers, vol.method) : null;
      if (vol) {
        const rule = volumetricRule(code, vol.method);
        const v = under('volumetric', () =>
          judgeVolumetric(rule, vol.indications, vol.examinerResult, c.thickness, c.outsideDiameter),
        );
        parts.push(
          part(vol.method, v, [
            {
              id: `${code}-${vol.method}`,
              name: vol.method === 'radiography' ? 'Radiography' : 'Ultrasonics',
              clause: rule.clause,
              source: rule.source,
            },
          ]),
        );
      }
      const bendsNeeded = !vol || volProblem !== null || (code === 'api-1104' && vol.method === 'ultrasonic');
      if (p.bend) parts.push(bendPart(p, codeSet, additional, bendCriteria));
      else if (bendsNeeded)
        parts.push(
          missing(
            'bend',
            volProblem?.clause ?? 'QW-302.1, QW-302.2 (examination of the coupon)',
            volProblem?.message ??
              'Record the bend specimens, or radiography/ultrasonics where the code allows it in their place.',
            bendCriteria,
          ),
        );
      if (code === 'api-1104' && !vol) {
        if (p.nickBreak) parts.push(nickBreakPart(p));
        else
          parts.push(
            missing(
              'nick-break',
              'API 1104 welder qualification specimens',
              'API 1104 welder tests are nick-broken as well as bent: record the nick-break specimens.',
              [],
            ),
          );
      } else if (p.nickBreak) parts.push(nickBreakPart(p));
    }
    if (p.layers) parts.push(combinationPart(p, p.layers));
  }
  let retest: RetestSetVerdict | undefined;
  if (p.retest) {
    const own = worst(parts.map((x) => x.result));
    const v = retestVerdict(code, p.retest, { result: own, volumetric: p.volumetric !== undefined });
    retest = v.set;
    const option = p.retest.basis === 'immediate' ? RETEST_RULES[code].immediate : RETEST_RULES[code].afterTraining;
    parts.push(
      part('retest', v, [
        { id: `${code}-retest`, name: 'Retest', clause: option.clause, source: option.source },
      ]),
    );
  }

  const result = worst(parts.map((x) => x.result));
  // one failure fails every process of a combination coupon
  for (const x of parts)
    if (x.kind === 'combination' && x.items) for (const it of x.items) it.result = result;
  return {
    result,
    parts,
    reasons: parts.flatMap((x) => x.reasons),
    codeCriteria: refOf(codeSet),
    additionalCriteria: additional ? refOf(additional) : null,
    rulesVersion: RULES_VERSION,
    notice: RANGES_NOTICE,
    ...(retest ? { retest } : {}),
  };
}
