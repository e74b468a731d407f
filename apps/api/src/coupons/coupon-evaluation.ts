// The server's verdict on a coupon, from the same rules package the form uses: the typed sizes are
// read again, the coupon must be one the rules can give ranges for, and the whole examination — visual
// first, then bends (their count and kinds checked against the coupon's code, form, position and
// thickness), radiography or ultrasonics in their place, fillet break and macro-etch, nick-breaks,
// combination layers, retest — is judged by evaluateCoupon given the whole coupon. Pure: no database,
// no clock.
import {
  RulesInputError,
  criteriaSets,
  evaluateCoupon as evaluateWholeCoupon,
  formatLength,
  parseLength,
  pipeDimensions,
  type Coupon,
  type CouponEvaluationInput,
  type CouponResult,
  type couponRecordInput,
  type CriteriaId,
  type CouponEvaluation as StoredEvaluation,
  type EvaluationPart,
  type RecordedExamination,
} from '@beadroll/rules';
import type { z } from 'zod';
import { CODE_NAMES } from '../documents/document-format.js';
import { AppError } from '../lib/errors.js';

export type CouponFields = Omit<z.output<typeof couponRecordInput>, 'welderId'>;
export type Result = 'accept' | 'reject' | 'replace-specimen';
export type Reason = { clause: string; message: string };

type RecordedSpecimen = NonNullable<RecordedExamination['bend']>['specimens'][number];
export type StoredSpecimen = RecordedSpecimen & { result: CouponResult; reasons: Reason[] };

/** The examination as stored: as recorded, each bend specimen with its verdict, and the visual findings. */
export type StoredExamination = Omit<RecordedExamination, 'bend'> & {
  bend?: { specimens: StoredSpecimen[] };
  visualFindings?: CouponFields['visual']['findings'];
};

export type CouponEvaluation = {
  coupon: Coupon;
  examination: StoredExamination;
  result: Result;
  reasons: Reason[];
  criteriaId: CriteriaId | null;
  additionalCriteriaId: CriteriaId | null;
  /** Stored with the coupon: the parts, the code's criteria met and any in-house set applied in addition. */
  evaluation: StoredEvaluation;
  rulesVersion: string;
};

/** A coupon is judged by its code's criteria; an in-house set only in addition (issue 9). */
function checkCriteria(input: CouponFields): void {
  const ex = input.examination;
  const code = input.coupon.code;
  if (ex.criteria !== undefined && ex.criteria !== code)
    throw AppError.validation(
      {
        'examination.criteria': `A ${CODE_NAMES[code]} coupon is judged by the code's own acceptance criteria (${criteriaSets[code].clause}); ${CODE_NAMES[ex.criteria as Coupon['code']] ?? 'shop practice'} criteria can be applied in addition (additionalCriteria), never instead`,
      },
      "The coupon must be judged by its code's acceptance criteria",
    );
}

const prefixed = (prefix: string, fields: Record<string, string>): Record<string, string> =>
  Object.fromEntries(Object.entries(fields).map(([k, v]) => [k ? `${prefix}.${k}` : prefix, v]));

const SAME = 1e-9;

/** Sizes typed on the form, read again; a size the client parsed differently is refused. */
function checkSizes(input: CouponFields, fields: Record<string, string>): void {
  (input.examination.bend?.specimens ?? []).forEach((s, i) =>
    s.discontinuities.forEach((d, j) => {
      const at = `examination.bend.specimens.${i}.discontinuities.${j}`;
      let parsed;
      try {
        parsed = parseLength(d.sizeText);
      } catch (err) {
        if (!(err instanceof RangeError)) throw err;
        fields[`${at}.sizeText`] =
          err instanceof RulesInputError ? (Object.values(err.fields)[0] ?? err.message) : err.message;
        return;
      }
      if (
        parsed.unit !== d.size.unit ||
        Math.abs(parsed.value - d.size.value) > SAME * Math.max(1, parsed.value)
      )
        fields[`${at}.size`] =
          `"${d.sizeText}" reads as ${formatLength(parsed)}, not ${formatLength(d.size)}`;
    }),
  );
}

function withPipe(input: CouponFields, fields: Record<string, string>): Coupon {
  const coupon = { ...input.coupon };
  if (!input.pipe) return coupon;
  if (coupon.form !== 'pipe') {
    fields.pipe = 'A pipe size was given for a plate coupon';
    return coupon;
  }
  try {
    const d = pipeDimensions(input.pipe.nps, input.pipe.schedule);
    coupon.outsideDiameter ??= d.outsideDiameter;
  } catch (err) {
    if (!(err instanceof RulesInputError)) throw err;
    Object.assign(fields, prefixed('pipe', err.fields));
  }
  return coupon;
}

/** The request field each examination part is recorded under (where a 400 about it points). */
export const PART_FIELDS: Record<EvaluationPart['kind'], string> = {
  visual: 'visual',
  bend: 'examination.bend',
  radiography: 'examination.volumetric',
  ultrasonic: 'examination.volumetric',
  'fillet-break': 'examination.filletBreak',
  'macro-etch': 'examination.macroEtch',
  'nick-break': 'examination.nickBreak',
  combination: 'examination.layers',
  retest: 'examination.retest',
};

/** A rules error's field, as the request names it ('bend.specimens.0…' → 'examination.bend.specimens.0…'). */
const requestField = (k: string): string =>
  k === '' ? 'examination' : /^(coupon|visual)(\.|$)/.test(k) ? k : `examination.${k}`;

/** The input of the rules' evaluateCoupon: the whole coupon and every part of its examination. */
export function evaluationInput(coupon: Coupon, input: CouponFields): CouponEvaluationInput {
  const ex = input.examination;
  const { reportUploadId: _r, ...volumetric } = ex.volumetric ?? { reportUploadId: null };
  return {
    coupon,
    visual: input.visual,
    ...(ex.additionalCriteria && ex.additionalCriteria !== coupon.code
      ? { additionalCriteria: ex.additionalCriteria }
      : {}),
    ...(ex.bend
      ? {
          bend: {
            specimens: ex.bend.specimens.map((s) => ({
              ...(s.label ? { id: s.label } : {}),
              kind: s.kind,
              discontinuities: s.discontinuities.map((d) => ({
                size: d.size,
                location: d.location,
                fusionRelated: d.fusionRelated,
                ...(d.type ? { type: d.type } : {}),
              })),
            })),
          },
        }
      : {}),
    ...(ex.volumetric ? { volumetric: volumetric as NonNullable<CouponEvaluationInput['volumetric']> } : {}),
    ...(ex.filletBreak ? { filletBreak: ex.filletBreak } : {}),
    ...(ex.macroEtch ? { macroEtch: ex.macroEtch } : {}),
    ...(ex.nickBreak ? { nickBreak: ex.nickBreak } : {}),
    ...(ex.layers ? { layers: ex.layers } : {}),
    ...(ex.retest ? { retest: ex.retest } : {}),
  };
}

const RESULT_WORDS: Record<CouponResult, string> = {
  accept: 'Accept',
  reject: 'Reject',
  'replace-specimen': 'Replace specimen',
  incomplete: 'Incomplete',
};

/** Evaluates a coupon as recorded; throws AppError 400 with the fields at fault. */
export function evaluateCoupon(input: CouponFields): CouponEvaluation {
  const fields: Record<string, string> = {};
  const coupon = withPipe(input, fields);
  checkSizes(input, fields);
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);
  checkCriteria(input);

  let evaluation: StoredEvaluation;
  try {
    evaluation = evaluateWholeCoupon(evaluationInput(coupon, input));
  } catch (err) {
    if (err instanceof RulesInputError) {
      const out: Record<string, string> = {};
      for (const [k, v] of Object.entries(err.fields)) out[requestField(k)] ??= v;
      throw AppError.validation(out, err.message);
    }
    throw err;
  }

  // The examination the code calls for is not all there (a short or mixed bend set, a missing nick-break,
  // radiography where the code forbids it…): never saved as a verdict, each missing part named.
  if (evaluation.result === 'incomplete') {
    const missing: Record<string, string> = {};
    for (const part of evaluation.parts)
      if (part.result === 'incomplete')
        missing[PART_FIELDS[part.kind]] ??= part.reasons.map((r) => `${r.message} (${r.clause})`).join(' ');
    throw AppError.validation(missing, 'The examination the code calls for is incomplete');
  }
  const result: Result = evaluation.result;

  if (input.claimedResult && input.claimedResult !== result) {
    const first = evaluation.reasons[0];
    throw AppError.validation(
      {
        claimedResult: `The evaluation gives ${RESULT_WORDS[result]}, not ${RESULT_WORDS[input.claimedResult]}: ${
          first ? `${first.message} (${first.clause})` : 'every part of the examination meets the criteria'
        }`,
      },
      'The recorded verdict disagrees with the evaluation',
    );
  }

  const ex = input.examination;
  const bendItems = evaluation.parts.find((x) => x.kind === 'bend')?.items ?? [];
  const { bend: _bend, ...rest } = ex;
  const examination: StoredExamination = {
    ...rest,
    criteria: coupon.code,
    ...(ex.bend
      ? {
          bend: {
            specimens: ex.bend.specimens.map((s, i) => ({
              ...s,
              photoUploadId: s.photoUploadId ?? null,
              result: bendItems[i]?.result ?? 'accept',
              reasons: bendItems[i]?.reasons ?? [],
            })),
          },
        }
      : {}),
    ...(input.visual.findings?.length ? { visualFindings: input.visual.findings } : {}),
  };
  const additional = evaluation.additionalCriteria?.id;
  return {
    coupon,
    examination,
    result,
    reasons: evaluation.reasons,
    criteriaId: ex.bend ? coupon.code : null,
    additionalCriteriaId:
      additional && additional in criteriaSets ? (additional as CriteriaId) : null,
    evaluation,
    rulesVersion: evaluation.rulesVersion,
  };
}

/** The uploads a coupon refers to, each with the field that names it. */
export function attachmentRefs(input: CouponFields): Array<{ field: string; id: string }> {
  const ex = input.examination;
  return [
    ...(ex.bend?.specimens ?? []).flatMap((s, i) =>
      s.photoUploadId ? [{ field: `examination.bend.specimens.${i}.photoUploadId`, id: s.photoUploadId }] : [],
    ),
    ...(ex.volumetric?.reportUploadId
      ? [{ field: 'examination.volumetric.reportUploadId', id: ex.volumetric.reportUploadId }]
      : []),
  ];
}

/** Why a WPS cannot back this coupon, or null when it can. */
export function procedureProblem(
  p: { number: string; revision: string; code: string; processes: string[]; status: string },
  coupon: { code: Coupon['code']; process: string },
  layers: ReadonlyArray<{ process: string }> = [],
): string | null {
  const name = `WPS ${p.number} rev ${p.revision}`;
  if (p.status !== 'active') return `${name} is superseded`;
  if (p.code !== coupon.code)
    return `${name} is for ${CODE_NAMES[p.code as Coupon['code']] ?? p.code}, not ${CODE_NAMES[coupon.code]}`;
  // a combination coupon is welded to one WPS that covers every process in it (QW-306)
  const missing = [coupon.process, ...layers.map((l) => l.process)].filter((x, i, all) => !p.processes.includes(x) && all.indexOf(x) === i);
  if (missing.length > 0) return `${name} does not cover ${missing.join(' and ')}`;
  return null;
}
