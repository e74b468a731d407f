// What the WPQ prints of a coupon's examination besides the visual examination and the bend table: each
// part as performed (radiography or ultrasonics with its indications, fillet weld break, macro-etch,
// nick-breaks, the processes of a combination coupon, a retest) with the server's verdict, the criteria
// it was judged by and what was recorded, in the trade's words.
import { formatLength, type CouponRecord, type EvaluationPart, type Length } from '@beadroll/rules';
import type { ExaminationPartData } from './document-data.js';

const PART_NAMES: Record<EvaluationPart['kind'], string> = {
  visual: 'Visual examination',
  bend: 'Guided bend tests',
  radiography: 'Radiography',
  ultrasonic: 'Ultrasonic examination',
  'fillet-break': 'Fillet weld break',
  'macro-etch': 'Macro-etch',
  'nick-break': 'Nick-break tests',
  combination: 'Combination of processes',
  retest: 'Retest',
};

const INDICATION_WORDS: Record<string, string> = {
  crack: 'Crack',
  'lack-of-fusion': 'Lack of fusion',
  'incomplete-penetration': 'Incomplete penetration',
  'elongated-slag': 'Elongated slag inclusion',
  'isolated-slag': 'Isolated slag inclusion',
  rounded: 'Rounded indication (porosity)',
  'burn-through': 'Burn-through',
  'hollow-bead': 'Hollow bead',
  'other-linear': 'Other linear indication',
};

const VISUAL_WORDS: Record<string, string> = {
  crack: 'Crack',
  'lack-of-fusion': 'Lack of fusion',
  'incomplete-penetration': 'Incomplete penetration',
  undercut: 'Undercut',
  porosity: 'Porosity',
  overlap: 'Overlap',
  'unfilled-crater': 'Unfilled crater',
  reinforcement: 'Excess reinforcement',
  'root-concavity': 'Root concavity',
  'burn-through': 'Burn-through',
  other: 'Other',
};

const size = (l: Length) => formatLength(l);
const yes = (b: boolean | undefined) => (b ? 'yes' : 'no');

function findingsOf(kind: EvaluationPart['kind'], ex: CouponRecord['examination']): string[] {
  switch (kind) {
    case 'radiography':
    case 'ultrasonic': {
      const v = ex.volumetric;
      if (!v) return [];
      return [
        ...(v.reportNumber ? [`Report ${v.reportNumber}`] : []),
        ...(v.examinerResult ? [`Report's verdict: ${v.examinerResult === 'accept' ? 'Accept' : 'Reject'}`] : []),
        ...(v.indications.length === 0
          ? ['No indications']
          : v.indications.map((i) => `${INDICATION_WORDS[i.type] ?? i.type}, ${size(i.size)}${i.width ? `, ${size(i.width)} wide` : ''}`)),
      ];
    }
    case 'fillet-break': {
      const b = ex.filletBreak;
      if (!b) return [];
      return [
        `Bent flat without fracture: ${yes(b.bentFlat)}; crack: ${yes(b.crack)}; incomplete root fusion: ${yes(b.incompleteRootFusion)}`,
        `Inclusions and pores: ${b.inclusions?.length ? b.inclusions.map(size).join(', ') : 'none recorded'}`,
      ];
    }
    case 'macro-etch': {
      const m = ex.macroEtch;
      if (!m) return [];
      return [
        `Complete fusion: ${yes(m.completeFusion)}; crack: ${yes(m.crack)}`,
        ...(m.legs ? [`Fillet legs ${size(m.legs[0])} and ${size(m.legs[1])}`] : []),
        ...(m.convexity ? [`Convexity ${size(m.convexity)}`] : []),
        ...(m.concavity ? [`Concavity ${size(m.concavity)}`] : []),
      ];
    }
    case 'nick-break':
      return (ex.nickBreak?.specimens ?? []).map(
        (s, i) =>
          `${s.id ?? `Nick-break ${i + 1}`}: penetration and fusion ${s.completePenetrationAndFusion ? 'complete' : 'not complete'}${
            s.gasPockets?.length ? `; gas pockets ${s.gasPockets.map(size).join(', ')}` : ''
          }`,
      );
    case 'combination':
      return (ex.layers ?? []).map((l, i) => `${i === 0 ? 'Root' : 'Then'}: ${l.process}, ${size(l.depositedThickness)} deposited`);
    case 'retest':
      return ex.retest
        ? [`Retest of ${ex.retest.of}, ${ex.retest.basis === 'immediate' ? 'immediate' : 'after further training'}`]
        : [];
    default:
      return [];
  }
}

/** Every part of the examination other than the visual examination and the bends, as performed. */
export function examinationPartsData(c: CouponRecord): ExaminationPartData[] {
  const v = c.examination.volumetric;
  // coupons recorded before the evaluation was stored: the report's verdict as recorded
  if (!c.evaluation && v)
    return [{ name: PART_NAMES[v.method], result: c.result, findings: findingsOf(v.method, c.examination), reasons: c.reasons }];
  return (c.evaluation?.parts ?? [])
    .filter((p) => p.kind !== 'visual' && p.kind !== 'bend')
    .map((p) => ({
      name: PART_NAMES[p.kind],
      result: p.result,
      ...(p.criteria[0] ? { judgedBy: p.criteria.map((x) => `${x.name} (${x.clause})`).join(', and in addition ') } : {}),
      findings: findingsOf(p.kind, c.examination),
      reasons: p.reasons,
    }));
}

/** The visual examination's findings, one line each. */
export const visualFindingLines = (c: CouponRecord): string[] =>
  c.visualFindings.map((f) => `${VISUAL_WORDS[f.type] ?? f.type}${f.size ? `, ${size(f.size)}` : ''}${f.note ? ` — ${f.note}` : ''}`);
