// Guided bend test acceptance: each specimen judged on its own against one BendCriteria; the coupon's
// result is the worst of its specimens. The judging below reads the criteria as data; no code branches
// on which named set is in use.
import {
  bendTestInputSchema,
  DEFAULT_CORNER_CAUSES,
  type BendCriteria,
  type BendTestInput,
  type Discontinuity,
} from '../schemas/bend.js';
import { type BendSpecimenProposalInput } from '../schemas/coupon.js';
import { exceeds, formatLength, limitIn, valueIn, type Length, type LengthUnit } from '../units/length.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { criteriaSets } from './criteria-sets.js';
import { proposeBendSpecimens, type SpecimenSet } from './propose-specimens.js';

/** 'incomplete': the specimen set is short or mixed; never an accept. */
export type BendResult = 'accept' | 'reject' | 'replace-specimen' | 'incomplete';
export type BendReason = { clause: string; message: string };
export type SpecimenEvaluation = {
  id?: string;
  kind: string;
  result: BendResult;
  /** Why the specimen rejects or needs a replacement: the clause and the measured and allowed size. */
  reasons: BendReason[];
  /** Indications that were looked at and did not count (e.g. a corner crack without a fusion cause). */
  notes: BendReason[];
};
export type BendEvaluation = {
  result: BendResult;
  criteria: { id: string; name: string; clause: string; source: string };
  specimens: SpecimenEvaluation[];
  /** Why the set is incomplete (short, or face, root and side bends mixed); empty when complete. */
  completeness: BendReason[];
};

// A reject is final; an incomplete set is never an accept, whatever its specimens show.
export const RESULT_RANK: Record<BendResult, number> = {
  accept: 0,
  'replace-specimen': 1,
  incomplete: 2,
  reject: 3,
};
export const worse = <R extends BendResult>(a: R, b: R): R => (RESULT_RANK[b] > RESULT_RANK[a] ? b : a);

const show = (value: number, unit: LengthUnit): string =>
  formatLength({ value, unit }, { digits: unit === 'mm' ? 2 : 3 });

/** A corner discontinuity with evidence of an internal cause counts (QW-163 "lack of fusion, slag
 *  inclusions, or other internal discontinuities"; API 1104 "obvious imperfections"). */
const hasCause = (c: BendCriteria, d: Discontinuity): boolean =>
  d.fusionRelated === true ||
  (d.type !== undefined && (c.corner.causes ?? DEFAULT_CORNER_CAUSES).includes(d.type));

function describe(d: Discontinuity, index: number): string {
  const what = d.type && d.type !== 'other' ? d.type.replace(/-/g, ' ') : 'discontinuity';
  const text = `${d.location === 'corner' ? 'corner ' : ''}${what} ${index + 1} (${show(d.size.value, d.size.unit)})`;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

const fractionWords = (f: number): string =>
  f === 0.5 ? 'one-half' : f === 0.25 ? 'one-quarter' : `${f} times`;

function singleLimit(
  c: BendCriteria,
  unit: LengthUnit,
  wall: Length | undefined,
): { value: number; why: string } {
  const base = limitIn(c.single.max, unit);
  const fraction = c.single.wallFraction;
  if (fraction === undefined || wall === undefined) return { value: base, why: show(base, unit) };
  const ofWall = fraction * valueIn(wall, unit);
  if (ofWall >= base)
    return {
      value: base,
      why: `${show(base, unit)} (smaller than ${fractionWords(fraction)} the ${formatLength(wall)} wall)`,
    };
  return {
    value: ofWall,
    why: `${show(ofWall, unit)}, ${fractionWords(fraction)} the ${formatLength(wall)} wall, which is smaller than ${show(base, unit)}`,
  };
}

function evaluateSpecimen(
  c: BendCriteria,
  specimen: BendTestInput['specimens'][number],
  wall: Length | undefined,
): SpecimenEvaluation {
  let result: BendResult = 'accept';
  const reasons: BendReason[] = [];
  const notes: BendReason[] = [];
  const counted: Length[] = [];
  const allowance = c.corner.allowance;

  specimen.discontinuities.forEach((d, i) => {
    const unit = d.size.unit;
    const size = d.size.value;
    if (d.location === 'corner' && c.corner.ignore === 'unless-fusion-related' && !hasCause(c, d)) {
      const cap = allowance ? limitIn(allowance.max, unit) : Infinity;
      const over = allowance ? (allowance.inclusive ? exceeds(size, cap) : !exceeds(cap, size)) : false;
      if (!over || !allowance) {
        notes.push({
          clause: c.clause,
          message: `${describe(d, i)} is not considered: it originates at the specimen's edge with no evidence of slag, lack of fusion or another internal cause${allowance ? ` and is ${allowance.inclusive ? 'within' : 'under'} the ${show(cap, unit)} allowed for such corner discontinuities` : ''}.`,
        });
        return;
      }
      const measured = `measured ${show(size, unit)}, allowed ${allowance.inclusive ? 'up to' : 'less than'} ${show(cap, unit)}`;
      if (allowance.over === 'reject') {
        result = worse(result, 'reject');
        reasons.push({
          clause: c.clause,
          message: `${describe(d, i)} is larger than the corner allowance and rejects the specimen (${measured}).`,
        });
        return;
      }
      if (allowance.over === 'replace-specimen') {
        result = worse(result, 'replace-specimen');
        reasons.push({
          clause: c.clause,
          message: `${describe(d, i)} is larger than the corner allowance without evidence of a fusion cause: disregard this specimen and test a replacement from the same coupon (${measured}).`,
        });
        return;
      }
      notes.push({
        clause: c.clause,
        message: `${describe(d, i)} is not less than the corner allowance, so it is judged like any other discontinuity (${measured}).`,
      });
    }
    const limit = singleLimit(c, unit, wall);
    if (exceeds(size, limit.value)) {
      result = worse(result, 'reject');
      reasons.push({
        clause: c.clause,
        message: `${describe(d, i)} is larger than the largest single discontinuity allowed (measured ${show(size, unit)}, allowed ${limit.why}).`,
      });
      return;
    }
    const countAbove = c.cumulative?.countAbove;
    if (c.cumulative && (!countAbove || exceeds(size, limitIn(countAbove, unit)))) counted.push(d.size);
  });

  // One test is recorded in one unit system (mixed entry is refused on the way in), so the sum and
  // its limit are in that system.
  const first = counted[0];
  if (c.cumulative && first) {
    const unit = first.unit;
    const sum = counted.reduce((s, l) => s + l.value, 0);
    const max = limitIn(c.cumulative.max, unit);
    if (exceeds(sum, max)) {
      const countAboveText = c.cumulative.countAbove
        ? ` (counting those over ${show(limitIn(c.cumulative.countAbove, unit), unit)})`
        : '';
      result = worse(result, 'reject');
      reasons.push({
        clause: c.clause,
        message: `The ${counted.length} counted discontinuities${countAboveText} add up to more than allowed on one specimen (measured ${show(sum, unit)} in all, allowed ${show(max, unit)}).`,
      });
    }
  }

  const out: SpecimenEvaluation = { kind: specimen.kind, result, reasons, notes };
  if (specimen.id !== undefined) out.id = specimen.id;
  return out;
}

type Specimens = BendTestInput['specimens'];

/** A whole test is judged in the one unit system it was recorded in; mixed entry is refused. */
export function checkOneUnit(specimens: Specimens, prefix = 'specimens'): void {
  let unit: LengthUnit | undefined;
  let firstAt = '';
  specimens.forEach((s, i) =>
    s.discontinuities.forEach((d, j) => {
      const at = `${prefix}.${i}.discontinuities.${j}.size.unit`;
      if (unit === undefined) {
        unit = d.size.unit;
        firstAt = at;
      } else if (d.size.unit !== unit)
        throw RulesInputError.field(
          at,
          `This test is recorded in ${unit === 'in' ? 'inches' : 'millimetres'} (the first size, ${firstAt.replace(/\.size\.unit$/, '')}, is in ${unit}): enter every size on one test in ${unit}. The codes draw their limits separately in each system (1/8 in, 3 mm), so one test is judged in one of them.`,
        );
    }),
  );
}

const countKinds = (specimens: Specimens) => {
  const n = { face: 0, root: 0, side: 0 };
  for (const s of specimens) n[s.kind]++;
  return n;
};

const setWords = (set: SpecimenSet): string => set.map((k) => `${k.count} ${k.kind}`).join(' + ');

const recordedWords = (n: { face: number; root: number; side: number }): string =>
  (['face', 'root', 'side'] as const)
    .filter((k) => n[k] > 0)
    .map((k) => `${n[k]} ${k}`)
    .join(' + ') || 'none';

/**
 * Whether the specimens hold the set. Under API 1104 the table gives the specimens of each kind a welder
 * test calls for; specimens of another kind bent as well (face bends beside the root bends of a wall up to
 * 1/2 in, as the procedure table has them) do not make the set short: every specimen tested is judged,
 * and a reject among them still rejects (from memory: API 1104 welder qualification specimen table,
 * Table 3 of the 20th edition; common practice (no source): extra specimens are judged, not refused).
 * Elsewhere a kind the set does not call for means a mixed set (QW-452.1(a)).
 */
const fits = (n: { face: number; root: number; side: number }, set: SpecimenSet, extraKindsJudged = false): boolean =>
  (['face', 'root', 'side'] as const).every((k) => {
    const need = set.find((s) => s.kind === k)?.count ?? 0;
    return need === 0 ? extraKindsJudged || n[k] === 0 : n[k] >= need;
  });

const GENERIC_CLAUSE = 'QW-302.3, QW-452.1(a) (complete specimen set)';

/**
 * Whether the specimens are the whole set: face and root bends in pairs, or side bends only (common
 * practice (no source); QW-302.3, QW-452.1(a) from memory); given the coupon, the code's table decides
 * the count (5G/6G four, 2G + 5G six, 3G + 4G two coupons).
 */
export function bendSetCompleteness(specimens: Specimens, coupon?: BendSpecimenProposalInput): BendReason[] {
  const n = countKinds(specimens);
  const proposal = coupon ? proposeBendSpecimens(coupon) : null;
  if (proposal?.known) {
    if (proposal.options.some((o) => fits(n, o, coupon?.code === 'api-1104'))) return [];
    return [
      {
        clause: proposal.clause ?? GENERIC_CLAUSE,
        message: `The specimen set is incomplete: ${proposal.options.map(setWords).join(', or ')} ${proposal.options.length > 1 ? 'are' : 'is'} called for (${proposal.text}); recorded: ${recordedWords(n)}.`,
      },
    ];
  }
  const pairs = n.side === 0 && n.face >= 1 && n.face === n.root;
  const sides = n.face === 0 && n.root === 0 && n.side >= 2;
  if (pairs || sides) return [];
  const why =
    n.side > 0 && n.face + n.root > 0
      ? 'side bends are mixed with face or root bends'
      : n.side === 1
        ? 'side bends come in pairs at least'
        : n.face !== n.root
          ? 'face and root bends must both be present, in equal numbers'
          : 'it is short';
  return [
    {
      clause: GENERIC_CLAUSE,
      message: `The specimen set is incomplete: ${why}; recorded: ${recordedWords(n)}. Every face bend needs its root bend, or use side bends only.`,
    },
  ];
}

/** Judge a bend test against a named criteria set or a custom one of the same shape. */
export function evaluateBendTest(input: BendTestInput): BendEvaluation {
  const parsed = parseInput(bendTestInputSchema, input);
  const c = typeof parsed.criteria === 'string' ? criteriaSets[parsed.criteria] : parsed.criteria;
  if (c.single.wallFraction !== undefined && parsed.wallThickness === undefined)
    throw RulesInputError.field(
      'wallThickness',
      `${c.name} limits a discontinuity by a fraction of the wall: enter the specified wall thickness`,
    );
  checkOneUnit(parsed.specimens);
  let result: BendResult = 'accept';
  const specimens = parsed.specimens.map((s) => {
    const e = evaluateSpecimen(c, s, parsed.wallThickness);
    result = worse(result, e.result);
    return e;
  });
  let completeness: BendReason[];
  try {
    completeness = bendSetCompleteness(parsed.specimens, parsed.coupon);
  } catch (err) {
    if (err instanceof RulesInputError)
      throw new RulesInputError(
        Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [`coupon.${k}`, v])),
      );
    throw err;
  }
  if (completeness.length > 0) result = worse(result, 'incomplete');
  return {
    result,
    criteria: { id: c.id, name: c.name, clause: c.clause, source: c.source },
    specimens,
    completeness,
  };
}
