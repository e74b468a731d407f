// The parts of a coupon's examination other than bends, each judged against the coupon code's values as
// data (TRADE.md §8). Every value names its clause and its kind of source; a size exactly at a limit passes.
import { type CodeId } from '../schemas/common.js';
import {
  type FilletBreak,
  type Indication,
  type IndicationType,
  type MacroEtch,
  type NickBreakSpecimen,
  type VisualExamination,
  type VisualFindingType,
} from '../schemas/examination.js';
import { exceeds, formatLength, limitIn, valueIn, type DualSize, type Length } from '../units/length.js';
import { RulesInputError } from '../validation/rules-input-error.js';

export type Reason = { clause: string; message: string };
export type PartVerdict = { result: 'accept' | 'reject' | 'incomplete'; reasons: Reason[]; notes: Reason[] };

const show = (l: Length): string => formatLength(l, { digits: l.unit === 'mm' ? 2 : 3 });
const dual = (d: DualSize, unit: Length['unit']): Length => ({ value: limitIn(d, unit), unit });
const words = (t: string): string => t.replace(/-/g, ' ');

/** Every length of one examination part must be in one unit system (judged in the system recorded). */
export function oneUnit(lengths: ReadonlyArray<readonly [string, Length | undefined]>): void {
  let first: readonly [string, Length] | undefined;
  for (const [path, l] of lengths) {
    if (!l) continue;
    if (!first) first = [path, l];
    else if (l.unit !== first[1].unit)
      throw RulesInputError.field(
        `${path}.unit`,
        `This examination is recorded in ${first[1].unit === 'in' ? 'inches' : 'millimetres'} (${first[0]} is in ${first[1].unit}): enter every size of it in ${first[1].unit}. Each code draws its limits separately in each system, so one examination is judged in one of them.`,
      );
  }
}

// ---- visual examination --------------------------------------------------------------------------------

type VisualRule = {
  clause: string;
  source: string;
  reject: Partial<Record<VisualFindingType, DualSize | 'any'>>;
};

// Findings a code rejects outright ('any') or above a size; anything else is left to the examiner's
// judgment, which is recorded with the visual result.
const VISUAL: Record<CodeId, VisualRule> = {
  'asme-ix': {
    clause: 'QW-302.4, QW-194',
    source: 'from memory: ASME IX QW-194 (no cracks; complete joint penetration with complete fusion)',
    reject: { crack: 'any', 'lack-of-fusion': 'any', 'incomplete-penetration': 'any' },
  },
  'aws-d1.1': {
    clause: 'AWS D1.1 4.9.1 (2015) welder visual criteria',
    source: 'from memory: AWS D1.1-2015 4.9.1 / 4.31.1 visual inspection of welder test welds',
    reject: {
      crack: 'any',
      'lack-of-fusion': 'any',
      'incomplete-penetration': 'any',
      'unfilled-crater': 'any',
      undercut: { in: 1 / 32, mm: 1 },
      reinforcement: { in: 1 / 8, mm: 3 },
    },
  },
  'api-1104': {
    clause: 'API 1104 welder qualification visual examination',
    source: 'from memory: API 1104 welder visual (free of cracks, inadequate penetration and burn-through)',
    reject: {
      crack: 'any',
      'lack-of-fusion': 'any',
      'incomplete-penetration': 'any',
      'burn-through': 'any',
      undercut: { in: 1 / 32, mm: 0.8 },
    },
  },
  'iso-9606-1': {
    clause: 'ISO 9606-1 visual testing, ISO 5817 level B',
    source: 'from memory: ISO 9606-1 (ISO 17637 visual testing, ISO 5817 level B)',
    reject: {
      crack: 'any',
      'lack-of-fusion': 'any',
      'incomplete-penetration': 'any',
      overlap: 'any',
      'unfilled-crater': 'any',
      'burn-through': 'any',
      undercut: { mm: 0.5 },
    },
  },
};

export function judgeVisual(
  code: CodeId,
  visual: VisualExamination,
): PartVerdict & { clause: string; source: string } {
  const rule = VISUAL[code];
  const reasons: Reason[] = [];
  const notes: Reason[] = [];
  const findings = visual.findings ?? [];
  oneUnit(findings.map((f, i) => [`visual.findings.${i}.size`, f.size] as const));
  if (visual.result === 'reject')
    reasons.push({ clause: rule.clause, message: 'The examiner rejected the weld on visual examination.' });
  const missing: Reason[] = [];
  findings.forEach((f, i) => {
    const limit = rule.reject[f.type];
    const what = `Visual finding ${i + 1}, ${words(f.type)}${f.size ? ` (${show(f.size)})` : ''}`;
    if (limit === 'any') {
      reasons.push({ clause: rule.clause, message: `${what}: not permitted on a welder's test coupon.` });
      return;
    }
    if (limit && !f.size) {
      missing.push({
        clause: rule.clause,
        message: `${what}: the code limits its size (${show(dual(limit, 'in'))}); enter the size measured.`,
      });
      return;
    }
    if (limit && f.size) {
      const max = limitIn(limit, f.size.unit);
      if (exceeds(f.size.value, max)) {
        reasons.push({
          clause: rule.clause,
          message: `${what}: more than the ${show({ value: max, unit: f.size.unit })} allowed.`,
        });
        return;
      }
    }
    notes.push({ clause: rule.clause, message: `${what}: judged by the examiner.` });
  });
  const result = reasons.length > 0 ? 'reject' : missing.length > 0 ? 'incomplete' : 'accept';
  return {
    result,
    reasons: result === 'incomplete' ? missing : reasons,
    notes,
    clause: rule.clause,
    source: rule.source,
  };
}

// ---- radiography and ultrasonics -------------------------------------------------------------------------

const PLANAR: IndicationType[] = ['crack', 'lack-of-fusion', 'incomplete-penetration'];

type VolumetricRule = {
  clause: string;
  source: string;
  /** The largest size allowed for an indication of this type on a coupon of thickness t and OD d. */
  limit: (
    type: IndicationType,
    t: Length,
    od: Length | undefined,
  ) => { max: number; why: string } | 'reject' | 'examiner';
  width?: (type: IndicationType, unit: Length['unit']) => { max: number; why: string } | null;
};

const valueOf = (d: DualSize, unit: Length['unit']) => limitIn(d, unit);

const asmeVolumetric = (method: 'radiography' | 'ultrasonic'): VolumetricRule => ({
  clause: method === 'radiography' ? 'QW-191.1.2.2' : 'QW-191.2.3',
  source: `from memory: ASME IX ${method === 'radiography' ? 'QW-191.1.2.2' : 'QW-191.2.3'} (performance qualification)`,
  limit(type, t, _od) {
    if (PLANAR.includes(type)) return 'reject';
    const u = t.unit;
    if (type === 'rounded') {
      if (method === 'ultrasonic') return 'examiner';
      const fifth = 0.2 * t.value;
      const cap = valueOf({ in: 1 / 8, mm: 3 }, u);
      return fifth < cap
        ? {
            max: fifth,
            why: `20 % of t = ${show({ value: fifth, unit: u })}, smaller than ${show({ value: cap, unit: u })}`,
          }
        : { max: cap, why: `${show({ value: cap, unit: u })}, smaller than 20 % of t` };
    }
    if (type === 'burn-through' || type === 'hollow-bead') return 'examiner';
    // elongated indications: 1/8 in up to t = 3/8 in; t/3 up to 2-1/4 in; 3/4 in over that
    if (!exceeds(t.value, valueOf({ in: 3 / 8, mm: 10 }, u)))
      return {
        max: valueOf({ in: 1 / 8, mm: 3 }, u),
        why: `${show(dual({ in: 1 / 8, mm: 3 }, u))} for t up to 3/8 in (10 mm)`,
      };
    if (!exceeds(t.value, valueOf({ in: 2.25, mm: 57 }, u)))
      return {
        max: t.value / 3,
        why: `t/3 = ${show({ value: t.value / 3, unit: u })} for t over 3/8 in up to 2-1/4 in (57 mm)`,
      };
    return {
      max: valueOf({ in: 3 / 4, mm: 19 }, u),
      why: `${show(dual({ in: 3 / 4, mm: 19 }, u))} for t over 2-1/4 in (57 mm)`,
    };
  },
});

const api1104Volumetric: VolumetricRule = {
  clause: 'API 1104 section 9 (radiographic acceptance standards)',
  source: 'from memory: API 1104 9.3 (individual indications; aggregate lengths are left to the examiner)',
  limit(type, t, od) {
    const u = t.unit;
    switch (type) {
      case 'crack':
        return 'reject';
      case 'incomplete-penetration':
      case 'lack-of-fusion':
        return {
          max: valueOf({ in: 1, mm: 25 }, u),
          why: `${show(dual({ in: 1, mm: 25 }, u))} for one indication`,
        };
      case 'elongated-slag':
        return { max: valueOf({ in: 2, mm: 50 }, u), why: `${show(dual({ in: 2, mm: 50 }, u))} long` };
      case 'hollow-bead':
        return {
          max: valueOf({ in: 1 / 2, mm: 13 }, u),
          why: `${show(dual({ in: 1 / 2, mm: 13 }, u))} long`,
        };
      case 'burn-through':
        return od && !exceeds(valueOf({ in: 2.375, mm: 60.3 }, od.unit), od.value)
          ? {
              max: valueOf({ in: 1 / 4, mm: 6 }, u),
              why: `${show(dual({ in: 1 / 4, mm: 6 }, u))} on pipe of 2-3/8 in OD and over`,
            }
          : 'examiner';
      case 'rounded': {
        const quarter = 0.25 * t.value;
        const cap = valueOf({ in: 1 / 8, mm: 3 }, u);
        return quarter < cap
          ? { max: quarter, why: `25 % of the wall = ${show({ value: quarter, unit: u })}` }
          : { max: cap, why: `${show({ value: cap, unit: u })} (smaller than 25 % of the wall)` };
      }
      default:
        return 'examiner';
    }
  },
  width(type, unit) {
    if (type === 'elongated-slag')
      return {
        max: valueOf({ in: 1 / 16, mm: 1.6 }, unit),
        why: `${show(dual({ in: 1 / 16, mm: 1.6 }, unit))} wide`,
      };
    if (type === 'isolated-slag')
      return {
        max: valueOf({ in: 1 / 8, mm: 3 }, unit),
        why: `${show(dual({ in: 1 / 8, mm: 3 }, unit))} wide`,
      };
    return null;
  },
};

const awsVolumetric: VolumetricRule = {
  clause: 'AWS D1.1 4.30.3 (2015) radiographic test of welder qualification',
  source:
    'from memory: AWS D1.1-2015 4.30.3 (planar discontinuities reject; the rest per the radiographic report)',
  limit: (type) => (PLANAR.includes(type) ? 'reject' : 'examiner'),
};

const isoVolumetric: VolumetricRule = {
  clause: 'ISO 9606-1 radiographic testing, ISO 17636 with ISO 5817 level B',
  source:
    'from memory: ISO 5817 level B (cracks, lack of fusion and incomplete penetration not permitted; single pore d ≤ 0.2 s, max 3 mm)',
  limit(type, t) {
    if (PLANAR.includes(type)) return 'reject';
    if (type !== 'rounded') return 'examiner';
    const u = t.unit;
    const fifth = 0.2 * t.value;
    const cap = valueOf({ mm: 3 }, u);
    return fifth < cap
      ? { max: fifth, why: `0.2 s = ${show({ value: fifth, unit: u })}` }
      : { max: cap, why: `${show({ value: cap, unit: u })} (smaller than 0.2 s)` };
  },
};

export function volumetricRule(code: CodeId, method: 'radiography' | 'ultrasonic'): VolumetricRule {
  switch (code) {
    case 'asme-ix':
      return asmeVolumetric(method);
    case 'aws-d1.1':
      return awsVolumetric;
    case 'api-1104':
      return api1104Volumetric;
    case 'iso-9606-1':
      return isoVolumetric;
  }
}

export function judgeVolumetric(
  rule: VolumetricRule,
  indications: Indication[],
  examinerResult: 'accept' | 'reject' | undefined,
  t: Length,
  od: Length | undefined,
): PartVerdict {
  oneUnit(
    indications.flatMap((d, i) => [
      [`volumetric.indications.${i}.size`, d.size] as const,
      [`volumetric.indications.${i}.width`, d.width] as const,
    ]),
  );
  const reasons: Reason[] = [];
  const notes: Reason[] = [];
  let needsExaminer = false;
  indications.forEach((d, i) => {
    const what = `Indication ${i + 1}, ${words(d.type)} (${show(d.size)})`;
    // the coupon thickness converted to the unit the indications were recorded in
    const tHere: Length = { value: valueIn(t, d.size.unit), unit: d.size.unit };
    const limit = rule.limit(d.type, tHere, od);
    if (limit === 'reject') {
      reasons.push({ clause: rule.clause, message: `${what}: not permitted, whatever its size.` });
      return;
    }
    if (limit === 'examiner') {
      needsExaminer = true;
      notes.push({
        clause: rule.clause,
        message: `${what}: Beadroll has no size limit for this type under this code; the examiner's verdict decides.`,
      });
    } else if (exceeds(d.size.value, limit.max)) {
      reasons.push({ clause: rule.clause, message: `${what}: larger than allowed (allowed ${limit.why}).` });
      return;
    }
    const w = rule.width?.(d.type, d.size.unit);
    if (w && d.width && exceeds(d.width.value, w.max))
      reasons.push({ clause: rule.clause, message: `${what}: ${show(d.width)} wide, more than ${w.why}.` });
  });
  if (examinerResult === 'reject')
    reasons.push({ clause: rule.clause, message: 'The examination report rejects the weld.' });
  if (reasons.length > 0) return { result: 'reject', reasons, notes };
  if (needsExaminer && examinerResult === undefined)
    return {
      result: 'incomplete',
      reasons: [
        {
          clause: rule.clause,
          message: "Record the examination report's verdict: some indications are judged by the examiner.",
        },
      ],
      notes,
    };
  return { result: 'accept', reasons, notes };
}

// ---- fillet weld break and macro-etch ----------------------------------------------------------------------

type BreakRule = {
  clause: string;
  source: string;
  single?: DualSize;
  sum?: DualSize;
  singleFraction?: number;
};

export const FILLET_BREAK: Record<CodeId, BreakRule> = {
  'asme-ix': {
    clause: 'QW-181.2, QW-182',
    source:
      'from memory: ASME IX QW-182 (no cracks or incomplete root fusion; inclusions and porosity together ≤ 3/8 in)',
    sum: { in: 3 / 8, mm: 10 },
  },
  'aws-d1.1': {
    clause: 'AWS D1.1 4.30.4.1 (2015) fillet weld break test',
    source:
      'from memory: AWS D1.1-2015 4.30.4.1 (no inclusion or pore over 3/32 in; sum ≤ 3/8 in in the 6 in specimen)',
    single: { in: 3 / 32, mm: 2.5 },
    sum: { in: 3 / 8, mm: 10 },
  },
  'api-1104': {
    clause: 'API 1104 fillet weld break (nick-break acceptance)',
    source:
      'from memory: API 1104 nick-break acceptance applied to fillet weld breaks (gas pockets ≤ 1/16 in)',
    single: { in: 1 / 16, mm: 1.6 },
  },
  'iso-9606-1': {
    clause: 'ISO 9606-1 fracture test (ISO 9017), ISO 5817 level B',
    source: 'from memory: ISO 5817 level B (no cracks or lack of fusion; single pore ≤ 0.2 s, max 3 mm)',
    single: { mm: 3 },
    singleFraction: 0.2,
  },
};

export function judgeFilletBreak(code: CodeId, b: FilletBreak, t: Length): PartVerdict {
  const rule = FILLET_BREAK[code];
  const inclusions = b.inclusions ?? [];
  oneUnit(inclusions.map((l, i) => [`filletBreak.inclusions.${i}`, l] as const));
  const reasons: Reason[] = [];
  const notes: Reason[] = [];
  if (b.crack) reasons.push({ clause: rule.clause, message: 'The fracture surface shows a crack.' });
  if (b.incompleteRootFusion)
    reasons.push({
      clause: rule.clause,
      message: 'The fracture surface shows incomplete fusion at the root.',
    });
  if (b.bentFlat && inclusions.length === 0 && reasons.length === 0)
    return {
      result: 'accept',
      reasons,
      notes: [{ clause: rule.clause, message: 'The specimen bent flat upon itself without fracture.' }],
    };
  const first = inclusions[0];
  if (first) {
    const u = first.unit;
    if (rule.single) {
      let max = limitIn(rule.single, u);
      let why = show({ value: max, unit: u });
      if (rule.singleFraction) {
        const f = rule.singleFraction * valueIn(t, u);
        if (f < max) {
          max = f;
          why = `${rule.singleFraction} × the ${show(t)} thickness = ${show({ value: f, unit: u })}`;
        }
      }
      inclusions.forEach((l, i) => {
        if (exceeds(l.value, max))
          reasons.push({
            clause: rule.clause,
            message: `Inclusion or pore ${i + 1} (${show(l)}) is larger than allowed (${why}).`,
          });
      });
    }
    if (rule.sum) {
      const sum = inclusions.reduce((s, l) => s + l.value, 0);
      const max = limitIn(rule.sum, u);
      if (exceeds(sum, max))
        reasons.push({
          clause: rule.clause,
          message: `The inclusions and pores add up to ${show({ value: sum, unit: u })}, more than the ${show({ value: max, unit: u })} allowed.`,
        });
    }
  }
  return { result: reasons.length > 0 ? 'reject' : 'accept', reasons, notes };
}

type MacroRule = {
  clause: string;
  source: string;
  legDifference?: DualSize;
  profile?: DualSize;
  legAtLeastSpecified?: boolean;
};

export const MACRO: Record<CodeId, MacroRule> = {
  'asme-ix': {
    clause: 'QW-184',
    source:
      'from memory: ASME IX QW-184 (complete fusion, no cracks; legs differ ≤ 1/8 in; convexity or concavity ≤ 1/16 in)',
    legDifference: { in: 1 / 8, mm: 3 },
    profile: { in: 1 / 16, mm: 1.5 },
  },
  'aws-d1.1': {
    clause: 'AWS D1.1 4.30.2 (2015) macroetch test',
    source:
      'from memory: AWS D1.1-2015 4.30.2 (fusion to the root, no cracks, legs at least the specified size)',
    legAtLeastSpecified: true,
  },
  'api-1104': {
    clause: 'API 1104 macro examination',
    source: 'from memory: complete fusion and no cracks (Beadroll default for API 1104 fillet coupons)',
  },
  'iso-9606-1': {
    clause: 'ISO 9606-1 macroscopic examination (ISO 17639), ISO 5817 level B',
    source: 'from memory: ISO 17639 / ISO 5817 level B (complete fusion, no cracks)',
  },
};

export function judgeMacro(code: CodeId, m: MacroEtch): PartVerdict {
  const rule = MACRO[code];
  oneUnit([
    ['macroEtch.legs.0', m.legs?.[0]],
    ['macroEtch.legs.1', m.legs?.[1]],
    ['macroEtch.convexity', m.convexity],
    ['macroEtch.concavity', m.concavity],
    ['macroEtch.specifiedSize', m.specifiedSize],
  ]);
  const reasons: Reason[] = [];
  if (!m.completeFusion)
    reasons.push({ clause: rule.clause, message: 'The etched section does not show complete fusion.' });
  if (m.crack) reasons.push({ clause: rule.clause, message: 'The etched section shows a crack.' });
  if (rule.legDifference && m.legs) {
    const [a, b] = m.legs;
    const diff = Math.abs(a.value - b.value);
    const max = limitIn(rule.legDifference, a.unit);
    if (exceeds(diff, max))
      reasons.push({
        clause: rule.clause,
        message: `The legs (${show(a)}, ${show(b)}) differ by ${show({ value: diff, unit: a.unit })}, more than ${show({ value: max, unit: a.unit })}.`,
      });
  }
  if (rule.profile)
    for (const [name, l] of [
      ['convexity', m.convexity],
      ['concavity', m.concavity],
    ] as const)
      if (l && exceeds(l.value, limitIn(rule.profile, l.unit)))
        reasons.push({
          clause: rule.clause,
          message: `The ${name} (${show(l)}) is more than ${show(dual(rule.profile, l.unit))}.`,
        });
  if (rule.legAtLeastSpecified && m.legs && m.specifiedSize) {
    const s = m.specifiedSize;
    m.legs.forEach((leg, i) => {
      if (exceeds(s.value, leg.value))
        reasons.push({
          clause: rule.clause,
          message: `Leg ${i + 1} (${show(leg)}) is smaller than the specified fillet size (${show(s)}).`,
        });
    });
  }
  return { result: reasons.length > 0 ? 'reject' : 'accept', reasons, notes: [] };
}

// ---- API 1104 nick-break -----------------------------------------------------------------------------------

export const NICK_BREAK = {
  clause: 'API 1104 nick-break test acceptance (welder qualification)',
  source:
    'from memory: API 1104 nick-break requirements (complete penetration and fusion; gas pocket ≤ 1/16 in, ≤ 2 % of the area; slag ≤ 1/32 in deep, ≤ 1/8 in or half the wall long, ≥ 1/2 in apart)',
  gasPocket: { in: 1 / 16, mm: 1.6 },
  areaPercent: 2,
  slagDepth: { in: 1 / 32, mm: 0.8 },
  slagLength: { in: 1 / 8, mm: 3 },
  slagSeparation: { in: 1 / 2, mm: 13 },
} as const;

export function judgeNickBreakSpecimen(s: NickBreakSpecimen, wall: Length, at: string): PartVerdict {
  const nb = NICK_BREAK;
  const pockets = s.gasPockets ?? [];
  const slag = s.slagInclusions ?? [];
  oneUnit([
    ...pockets.map((l, i) => [`${at}.gasPockets.${i}`, l] as const),
    ...slag.flatMap((l, i) => [
      [`${at}.slagInclusions.${i}.depth`, l.depth] as const,
      [`${at}.slagInclusions.${i}.length`, l.length] as const,
    ]),
    [`${at}.slagMinSeparation`, s.slagMinSeparation] as const,
  ]);
  const reasons: Reason[] = [];
  const c = nb.clause;
  if (!s.completePenetrationAndFusion)
    reasons.push({ clause: c, message: 'The broken surface does not show complete penetration and fusion.' });
  pockets.forEach((l, i) => {
    const max = limitIn(nb.gasPocket, l.unit);
    if (exceeds(l.value, max))
      reasons.push({
        clause: c,
        message: `Gas pocket ${i + 1} (${show(l)}) is larger than ${show({ value: max, unit: l.unit })}.`,
      });
  });
  if (s.gasPocketAreaPercent !== undefined && exceeds(s.gasPocketAreaPercent, nb.areaPercent))
    reasons.push({
      clause: c,
      message: `Gas pockets cover ${s.gasPocketAreaPercent} % of the broken surface, more than ${nb.areaPercent} %.`,
    });
  slag.forEach((l, i) => {
    const u = l.length.unit;
    const depth = limitIn(nb.slagDepth, l.depth.unit);
    if (exceeds(l.depth.value, depth))
      reasons.push({
        clause: c,
        message: `Slag inclusion ${i + 1} is ${show(l.depth)} deep, more than ${show({ value: depth, unit: l.depth.unit })}.`,
      });
    const half = 0.5 * valueIn(wall, u);
    const base = limitIn(nb.slagLength, u);
    const max = Math.min(half, base);
    if (exceeds(l.length.value, max))
      reasons.push({
        clause: c,
        message: `Slag inclusion ${i + 1} is ${show(l.length)} long, more than ${show({ value: max, unit: u })} (${half < base ? 'one-half the wall' : show({ value: base, unit: u })}, whichever is smaller).`,
      });
  });
  if (slag.length >= 2 && s.slagMinSeparation) {
    const sep = s.slagMinSeparation;
    const min = limitIn(nb.slagSeparation, sep.unit);
    if (exceeds(min, sep.value))
      reasons.push({
        clause: c,
        message: `Adjacent slag inclusions are ${show(sep)} apart, less than ${show({ value: min, unit: sep.unit })}.`,
      });
  }
  if (slag.length >= 2 && !s.slagMinSeparation)
    return {
      result: reasons.length > 0 ? 'reject' : 'incomplete',
      reasons:
        reasons.length > 0
          ? reasons
          : [
              {
                clause: c,
                message: 'Two or more slag inclusions: enter the smallest distance between adjacent ones.',
              },
            ],
      notes: [],
    };
  return { result: reasons.length > 0 ? 'reject' : 'accept', reasons, notes: [] };
}
