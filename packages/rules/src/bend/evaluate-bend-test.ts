// Guided bend test acceptance: each specimen judged on its own against one BendCriteria; the coupon's
// result is the worst of its specimens. The judging below reads the criteria as data; no code branches
// on which named set is in use.
import {
  bendTestInputSchema,
  type BendCriteria,
  type BendTestInput,
  type Discontinuity,
} from '../schemas/bend.js';
import { exceeds, formatLength, limitIn, valueIn, type Length, type LengthUnit } from '../units/length.js';
import { parseInput } from '../validation/parse-input.js';
import { RulesInputError } from '../validation/rules-input-error.js';
import { criteriaSets } from './criteria-sets.js';

export type BendResult = 'accept' | 'reject' | 'replace-specimen';
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
};

const RANK: Record<BendResult, number> = { accept: 0, 'replace-specimen': 1, reject: 2 };
const worse = (a: BendResult, b: BendResult): BendResult => (RANK[b] > RANK[a] ? b : a);

const show = (value: number, unit: LengthUnit): string =>
  formatLength({ value, unit }, { digits: unit === 'mm' ? 2 : 3 });

const isFusionRelated = (d: Discontinuity): boolean =>
  d.fusionRelated === true || d.type === 'slag' || d.type === 'lack-of-fusion';

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
    if (d.location === 'corner' && c.corner.ignore === 'unless-fusion-related' && !isFusionRelated(d)) {
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

  if (c.cumulative && counted.length > 0) {
    const sumIn = counted.reduce((s, l) => s + valueIn(l, 'in'), 0);
    const sumMm = counted.reduce((s, l) => s + valueIn(l, 'mm'), 0);
    const units = new Set(counted.map((l) => l.unit));
    // Mixed units on one specimen: the sum has to pass in both systems (the stricter answer).
    const checks: LengthUnit[] = units.size === 1 ? [...units] : ['in', 'mm'];
    for (const unit of checks) {
      const sum = unit === 'in' ? sumIn : sumMm;
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
        break;
      }
    }
  }

  const out: SpecimenEvaluation = { kind: specimen.kind, result, reasons, notes };
  if (specimen.id !== undefined) out.id = specimen.id;
  return out;
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
  let result: BendResult = 'accept';
  const specimens = parsed.specimens.map((s) => {
    const e = evaluateSpecimen(c, s, parsed.wallThickness);
    result = worse(result, e.result);
    return e;
  });
  return { result, criteria: { id: c.id, name: c.name, clause: c.clause, source: c.source }, specimens };
}
