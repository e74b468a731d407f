// What the WPQ prints of a coupon's examination besides the visual examination and the bend table: each
// part as performed (radiography or ultrasonics with its indications, fillet weld break, macro-etch,
// nick-breaks, the processes of a combination coupon, a retest) with the server's verdict, the criteria
// it was judged by and what was recorded, in the trade's words.
import {
  examinationPartNames,
  formatLength,
  indicationNames,
  visualFindingNames,
  type CouponRecord,
  type EvaluationPart,
  type Length,
} from '@beadroll/rules';
import type { ExaminationPartData } from './document-data.js';

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
          : v.indications.map((i) => `${indicationNames[i.type]}, ${size(i.size)}${i.width ? `, ${size(i.width)} wide` : ''}`)),
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
    return [{ name: examinationPartNames[v.method], result: c.result, findings: findingsOf(v.method, c.examination), reasons: c.reasons }];
  return (c.evaluation?.parts ?? [])
    .filter((p) => p.kind !== 'visual' && p.kind !== 'bend')
    .map((p) => ({
      name: examinationPartNames[p.kind],
      result: p.result,
      ...(p.criteria[0] ? { judgedBy: p.criteria.map((x) => `${x.name} (${x.clause})`).join(', and in addition ') } : {}),
      findings: findingsOf(p.kind, c.examination),
      reasons: p.reasons,
    }));
}

/** The visual examination's findings, one line each. */
export const visualFindingLines = (c: CouponRecord): string[] =>
  c.visualFindings.map((f) => `${visualFindingNames[f.type]}${f.size ? `, ${size(f.size)}` : ''}${f.note ? ` — ${f.note}` : ''}`);
