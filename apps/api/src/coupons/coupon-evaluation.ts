// The server's verdict on a coupon, from the same rules package the form uses: the typed sizes are
// read again, the coupon must be one the rules can give ranges for, the bend specimens are judged (or the
// RT/UT result taken) and combined with the visual examination. Pure: no database, no clock.
import {
  RANGES_NOTICE,
  RULES_VERSION,
  RulesInputError,
  criteriaSets,
  evaluateBendTest,
  formatLength,
  parseLength,
  pipeDimensions,
  qualifiedRanges,
  type Coupon,
  type couponRecordInput,
  type recordedDiscontinuitySchema,
  type CriteriaId,
  type CouponEvaluation as StoredEvaluation,
  type CriteriaRef,
  type EvaluationPart,
} from '@beadroll/rules';
import type { z } from 'zod';
import { CODE_NAMES } from '../documents/document-format.js';
import { AppError } from '../lib/errors.js';

export type CouponFields = Omit<z.output<typeof couponRecordInput>, 'welderId'>;
export type Result = 'accept' | 'reject' | 'replace-specimen';
export type Reason = { clause: string; message: string };

export type StoredSpecimen = {
  label?: string;
  kind: 'face' | 'root' | 'side';
  discontinuities: z.output<typeof recordedDiscontinuitySchema>[];
  photoUploadId: string | null;
  result: Result;
  reasons: Reason[];
};

export type StoredExamination =
  | { method: 'bend'; criteria: CriteriaId; additionalCriteria?: CriteriaId; specimens: StoredSpecimen[] }
  | {
      method: 'radiography' | 'ultrasonic';
      result: 'accept' | 'reject';
      reportNumber: string;
      reportUploadId: string | null;
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

const refOf = (c: { id: string; name: string; clause: string; source: string }): CriteriaRef => ({
  id: c.id,
  name: c.name,
  clause: c.clause,
  source: c.source,
});

/** A coupon is judged by its code's criteria; an in-house set only in addition (issue 9). */
function checkCriteria(input: CouponFields): void {
  const ex = input.examination;
  if (ex.method !== 'bend') return;
  const code = input.coupon.code;
  if (ex.criteria !== code)
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
  if (input.examination.method !== 'bend') return;
  input.examination.specimens.forEach((s, i) =>
    s.discontinuities.forEach((d, j) => {
      const at = `examination.specimens.${i}.discontinuities.${j}`;
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

const visualReason = (code: Coupon['code']): Reason => ({
  clause: `${CODE_NAMES[code]} visual examination`,
  message: 'Visual examination rejected',
});

const RANK: Record<Result, number> = { accept: 0, 'replace-specimen': 1, reject: 2 };

/** Evaluates a coupon as recorded; throws AppError 400 with the fields at fault. */
export function evaluateCoupon(input: CouponFields): CouponEvaluation {
  const fields: Record<string, string> = {};
  const coupon = withPipe(input, fields);
  checkSizes(input, fields);
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);
  checkCriteria(input);

  try {
    qualifiedRanges(coupon);
  } catch (err) {
    if (err instanceof RulesInputError)
      throw AppError.validation(prefixed('coupon', err.fields), err.message);
    throw err;
  }

  let examination: StoredExamination;
  let examResult: Result;
  let reasons: Reason[] = [];
  const ex = input.examination;
  const extra =
    ex.method === 'bend' && ex.additionalCriteria && ex.additionalCriteria !== coupon.code
      ? ex.additionalCriteria
      : null;
  let examPart: EvaluationPart;
  if (ex.method === 'bend') {
    const specimens = ex.specimens.map((s) => ({
      ...(s.label ? { id: s.label } : {}),
      kind: s.kind,
      discontinuities: s.discontinuities.map((d) => ({
        size: d.size,
        location: d.location,
        fusionRelated: d.fusionRelated,
        ...(d.type ? { type: d.type } : {}),
      })),
    }));
    const judge = (criteria: CriteriaId) => {
      try {
        return evaluateBendTest({ criteria, wallThickness: coupon.thickness, specimens });
      } catch (err) {
        if (err instanceof RulesInputError)
          throw AppError.validation(prefixed('examination', err.fields), err.message);
        throw err;
      }
    };
    const byCode = judge(ex.criteria);
    const byExtra = extra ? judge(extra) : null;
    // the in-house set only adds: each specimen takes the worse of the two verdicts
    const evaluation = byExtra
      ? {
          ...byCode,
          result:
            RANK[byExtra.result as Result] > RANK[byCode.result as Result] ? byExtra.result : byCode.result,
          specimens: byCode.specimens.map((s, i) => {
            const e = byExtra.specimens[i];
            if (!e || RANK[e.result as Result] <= RANK[s.result as Result])
              return { ...s, reasons: [...s.reasons, ...(e?.reasons ?? [])] };
            return { ...s, result: e.result, reasons: [...s.reasons, ...e.reasons] };
          }),
        }
      : byCode;
    // a short or mixed specimen set is never judged as a whole (QW-302.3, QW-452.1(a))
    if (evaluation.result === 'incomplete')
      throw AppError.validation(
        { 'examination.specimens': evaluation.completeness[0]?.message ?? 'The specimen set is incomplete' },
        'The bend specimen set is incomplete',
      );
    examResult = evaluation.result;
    examination = {
      method: 'bend',
      criteria: ex.criteria,
      ...(extra ? { additionalCriteria: extra } : {}),
      specimens: ex.specimens.map((s, i) => {
        const e = evaluation.specimens[i];
        return {
          ...(s.label ? { label: s.label } : {}),
          kind: s.kind,
          discontinuities: s.discontinuities,
          photoUploadId: s.photoUploadId ?? null,
          result: e?.result === 'incomplete' || !e ? 'accept' : e.result,
          reasons: e?.reasons ?? [],
        };
      }),
    };
    reasons = examination.specimens.flatMap((s) =>
      s.reasons.map((r) => ({ clause: r.clause, message: s.label ? `${s.label}: ${r.message}` : r.message })),
    );
    examPart = {
      kind: 'bend',
      result: examResult,
      criteria: [refOf(criteriaSets[ex.criteria]), ...(extra ? [refOf(criteriaSets[extra])] : [])],
      reasons,
      notes: evaluation.specimens.flatMap((s) => s.notes),
      items: examination.specimens.map((s) => ({
        ...(s.label ? { id: s.label } : {}),
        kind: s.kind,
        result: s.result,
        reasons: s.reasons,
      })),
    };
  } else {
    examResult = ex.result;
    examination = {
      method: ex.method,
      result: ex.result,
      reportNumber: ex.reportNumber,
      reportUploadId: ex.reportUploadId ?? null,
    };
    const words = ex.method === 'radiography' ? 'Radiographic' : 'Ultrasonic';
    if (ex.result === 'reject')
      reasons.push({
        clause: `${CODE_NAMES[coupon.code]} ${words.toLowerCase()} examination`,
        message: `${words} examination rejected${ex.reportNumber ? ` (report ${ex.reportNumber})` : ''}`,
      });
    examPart = {
      kind: ex.method,
      result: examResult,
      criteria: [
        {
          id: `${coupon.code}-${ex.method}`,
          name: `${words} examination report`,
          clause: `${CODE_NAMES[coupon.code]} ${words.toLowerCase()} examination`,
          source: "the examination report's verdict",
        },
      ],
      reasons: [...reasons],
      notes: [],
    };
  }
  const visualPart: EvaluationPart = {
    kind: 'visual',
    result: input.visual,
    criteria: [],
    reasons: input.visual === 'reject' ? [visualReason(coupon.code)] : [],
    notes: [],
  };

  let result = examResult;
  if (input.visual === 'reject') {
    result = 'reject';
    reasons = [visualReason(coupon.code), ...reasons];
  }
  if (RANK[examResult] > RANK[result]) result = examResult;

  if (input.claimedResult && input.claimedResult !== result) {
    const first = reasons[0];
    throw AppError.validation(
      {
        claimedResult: `The evaluation gives ${result}, not ${input.claimedResult}: ${
          first ? `${first.message} (${first.clause})` : 'no discontinuity exceeds the criteria'
        }`,
      },
      'The recorded verdict disagrees with the evaluation',
    );
  }

  const codeSet = criteriaSets[coupon.code];
  return {
    coupon,
    examination,
    result,
    reasons,
    criteriaId: ex.method === 'bend' ? ex.criteria : null,
    additionalCriteriaId: extra,
    evaluation: {
      result,
      // a visual reject stops the examination there
      parts: input.visual === 'reject' ? [visualPart] : [visualPart, examPart],
      reasons,
      codeCriteria: refOf(codeSet),
      additionalCriteria: extra ? refOf(criteriaSets[extra]) : null,
      rulesVersion: RULES_VERSION,
      notice: RANGES_NOTICE,
    },
    rulesVersion: RULES_VERSION,
  };
}

/** The uploads a coupon refers to, each with the field that names it. */
export function attachmentRefs(input: CouponFields): Array<{ field: string; id: string }> {
  const ex = input.examination;
  if (ex.method === 'bend')
    return ex.specimens.flatMap((s, i) =>
      s.photoUploadId ? [{ field: `examination.specimens.${i}.photoUploadId`, id: s.photoUploadId }] : [],
    );
  return ex.reportUploadId ? [{ field: 'examination.reportUploadId', id: ex.reportUploadId }] : [];
}

/** Why a WPS cannot back this coupon, or null when it can. */
export function procedureProblem(
  p: { number: string; revision: string; code: string; processes: string[]; status: string },
  coupon: { code: Coupon['code']; process: string },
): string | null {
  const name = `WPS ${p.number} rev ${p.revision}`;
  if (p.status !== 'active') return `${name} is superseded`;
  if (p.code !== coupon.code)
    return `${name} is for ${CODE_NAMES[p.code as Coupon['code']] ?? p.code}, not ${CODE_NAMES[coupon.code]}`;
  if (!p.processes.includes(coupon.process)) return `${name} does not cover ${coupon.process}`;
  return null;
}
