// The coupon form's state and everything the browser computes from it while it is filled in: the
// lengths read from what was typed, the pipe's OD and wall from NPS and schedule, the proposed bend
// specimens, the live verdict (evaluateBendTest, the same rules the server runs) and the qualified
// ranges preview. Pure functions, so the component tests and the form agree on every answer.
// Error keys are the API's dotted paths (coupon.thickness, examination.bend.specimens.0.discontinuities.1.size),
// so a 400 from the server lands on the same fields as the live checks.
import { codeNames } from '@/lib/codes';
import { firstMessage, readLength, type LengthRead } from '@/lib/lengths';
import {
  couponRecordInput,
  criteriaSets,
  evaluateBendTest,
  fieldsOf,
  isFilletTest,
  positionTables,
  splitTestPosition,
  testPositions,
  lengthBounds,
  pipeDimensions,
  proposeBendSpecimens,
  qualifiedRanges,
  RulesInputError,
  type BendEvaluation,
  type BendSpecimenProposal,
  type CodeId,
  type CouponInput,
  type CouponRecordInput,
  type CriteriaId,
  type discontinuityTypes,
  type Length,
  type ParsedLength,
  type Procedure,
  type Process,
  type Progression,
  type QualifiedRanges,
  type TestPosition,
  type TransferMode,
  type Upload,
} from '@beadroll/rules';

export type Errors = Record<string, string>;
export type SpecimenKind = 'face' | 'root' | 'side';
export type DiscontinuityType = (typeof discontinuityTypes)[number];
export type Verdict = 'accept' | 'reject' | 'replace-specimen';

export interface DiscontinuityDraft {
  key: string;
  sizeText: string;
  location: 'surface' | 'corner';
  type: DiscontinuityType | '';
  fusionRelated: boolean;
}

export interface SpecimenDraft {
  key: string;
  kind: SpecimenKind;
  /** Marked once the specimen is bent and looked at; until every one is, there is no verdict. */
  examined: boolean;
  discontinuities: DiscontinuityDraft[];
  photo: Upload | null;
}

export interface CouponDraft {
  welderId: string;
  shopId: string;
  procedureId: string;
  testedOn: string;
  code: CodeId | '';
  process: Process | '';
  transferMode: TransferMode | '';
  form: 'plate' | 'pipe';
  pipeBy: 'size' | 'measured';
  nps: string;
  schedule: string;
  outsideDiameterText: string;
  weld: 'groove' | 'fillet';
  position: string;
  thicknessText: string;
  depositedText: string;
  layersText: string;
  backing: 'with' | 'without' | '';
  fNumberText: string;
  progression: Progression | '';
  pNumbersText: string;
  examinerName: string;
  examinerCertificate: string;
  labReportNumber: string;
  visual: 'accept' | 'reject' | '';
  method: 'bend' | 'radiography' | 'ultrasonic';
  criteria: CriteriaId;
  /** False until the person changes the set of specimens; until then the form follows the proposal. */
  specimensChosen: boolean;
  specimens: SpecimenDraft[];
  volumetricResult: 'accept' | 'reject' | '';
  reportNumber: string;
  report: Upload | null;
  notes: string;
}

let counter = 0;
export const newKey = (): string => `k${(counter += 1)}`;

export const newDiscontinuity = (): DiscontinuityDraft => ({
  key: newKey(),
  sizeText: '',
  location: 'surface',
  type: '',
  fusionRelated: false,
});

export const newSpecimen = (kind: SpecimenKind): SpecimenDraft => ({ key: newKey(), kind, examined: false, discontinuities: [], photo: null });

export const todayIso = (): string => new Date().toISOString().slice(0, 10);

export interface DraftPrefill {
  welderId?: string;
  shopId?: string;
  code?: string;
  process?: string;
  position?: string;
  form?: string;
}

const codes: readonly string[] = ['asme-ix', 'aws-d1.1', 'api-1104', 'iso-9606-1'];
const processList: readonly string[] = ['SMAW', 'GTAW', 'GMAW', 'FCAW', 'SAW', 'PAW', 'OFW'];

export function emptyDraft(prefill: DraftPrefill = {}): CouponDraft {
  const code = prefill.code && codes.includes(prefill.code) ? (prefill.code as CodeId) : '';
  const position = prefill.position ?? '';
  return {
    welderId: prefill.welderId ?? '',
    shopId: prefill.shopId ?? '',
    procedureId: '',
    testedOn: todayIso(),
    code,
    process: prefill.process && processList.includes(prefill.process) ? (prefill.process as Process) : '',
    transferMode: '',
    form: prefill.form === 'pipe' ? 'pipe' : 'plate',
    pipeBy: 'size',
    nps: '',
    schedule: '',
    outsideDiameterText: '',
    weld: position.toUpperCase().endsWith('F') ? 'fillet' : 'groove',
    position,
    thicknessText: '',
    depositedText: '',
    layersText: '',
    backing: '',
    fNumberText: '',
    progression: '',
    pNumbersText: '',
    examinerName: '',
    examinerCertificate: '',
    labReportNumber: '',
    visual: '',
    method: 'bend',
    criteria: code || 'asme-ix',
    specimensChosen: false,
    specimens: [],
    volumetricResult: '',
    reportNumber: '',
    report: null,
    notes: '',
  };
}

// ---- what the form offers -----------------------------------------------------------------------

/** The test positions the rules know for the code and coupon form (any code's while none is chosen):
 *  a plate coupon is never offered 5G or 6G, a pipe coupon never 3G or 4G. */
export function positionsOffered(code: CodeId | '', form: 'plate' | 'pipe', weld: 'groove' | 'fillet'): TestPosition[] {
  const known = new Set<string>();
  for (const set of code ? [positionTables[code]] : Object.values(positionTables))
    for (const tables of [set, ...Object.values(set.byProgression ?? {})]) Object.keys(tables[form]).forEach((p) => known.add(p));
  return testPositions.filter((p) => isFilletTest(p) === (weld === 'fillet') && splitTestPosition(p).every((part) => known.has(part)));
}

/** The base metal P-Nos. and F-No. a WPS states, as the form's fields hold them (empty where it states none). */
export const fromProcedure = (p: Pick<Procedure, 'pNumbers' | 'fNumber'>): Pick<CouponDraft, 'pNumbersText' | 'fNumberText'> => ({
  pNumbersText: p.pNumbers.join(', '),
  fNumberText: p.fNumber === null ? '' : String(p.fNumber),
});

/** 'ASME IX bend criteria (QW-163)', 'API 1104 bend criteria': the code once, and its clause only when it adds a number. */
export function criteriaLabel(id: CriteriaId): string {
  const set = criteriaSets[id];
  if (id === 'shop-general') return set.name;
  const code = codeNames[id];
  const rest = set.clause.startsWith(code) ? set.clause.slice(code.length).trim() : set.clause;
  return /\d/.test(rest) ? `${code} bend criteria (${rest})` : `${code} bend criteria`;
}

// ---- reading what was typed ---------------------------------------------------------------------

const plain = (l: ParsedLength): Length => ({ value: l.value, unit: l.unit });

export type PipeFill = { ok: true; outsideDiameter: Length; wall: Length } | { ok: false; errors: Errors } | null;

/** OD and nominal wall of NPS + schedule (ASME B36.10M) for the pipe-by-size fields. */
export function pipeFill(nps: string, schedule: string): PipeFill {
  if (nps.trim() === '' || schedule.trim() === '') return null;
  try {
    const d = pipeDimensions(nps, schedule);
    return { ok: true, outsideDiameter: d.outsideDiameter, wall: d.wall };
  } catch (error) {
    if (error instanceof RulesInputError)
      return { ok: false, errors: Object.fromEntries(Object.entries(error.fields).map(([k, v]) => [`pipe.${k}`, v])) };
    throw error;
  }
}

const prefixed = (prefix: string, fields: Errors): Errors =>
  Object.fromEntries(Object.entries(fields).map(([k, v]) => [k ? `${prefix}.${k}` : prefix, v]));

/** The message for a field: its own key, else the first error under it (coupon.thickness.value). */
export function errorFor(errors: Errors, path: string): string | undefined {
  if (errors[path]) return errors[path];
  const child = Object.keys(errors).find((k) => k.startsWith(`${path}.`));
  return child ? errors[child] : undefined;
}

/** Drops the errors of a field the person just changed (its key and everything under it). */
export function withoutErrors(errors: Errors, path: string): Errors {
  const out: Errors = {};
  for (const [k, v] of Object.entries(errors)) if (k !== path && !k.startsWith(`${path}.`)) out[k] = v;
  return out;
}

// ---- the coupon as the rules read it -------------------------------------------------------------

interface CouponBuild {
  coupon: CouponInput | null;
  errors: Errors;
  /** What is still needed before the ranges can be computed, in plain words. */
  missing: string[];
  thickness: Length | null;
  pipe: { nps: string; schedule: string } | null;
}

function buildCoupon(d: CouponDraft): CouponBuild {
  const errors: Errors = {};
  const missing: string[] = [];
  let thickness: Length | null = null;
  let outsideDiameter: Length | undefined;
  let pipe: CouponBuild['pipe'] = null;

  const take = (key: string, read: LengthRead): Length | undefined => {
    if (read === null) return undefined;
    if (!read.ok) {
      errors[key] = read.error;
      return undefined;
    }
    return plain(read.length);
  };

  if (d.form === 'pipe' && d.pipeBy === 'size') {
    const fill = pipeFill(d.nps, d.schedule);
    if (fill === null) missing.push('the pipe size and schedule');
    else if (!fill.ok) Object.assign(errors, fill.errors);
    else {
      thickness = fill.wall;
      outsideDiameter = fill.outsideDiameter;
      pipe = { nps: d.nps.trim(), schedule: d.schedule.trim() };
    }
  } else {
    thickness = take('coupon.thickness', readLength(d.thicknessText, { positive: true, bounds: lengthBounds.thickness })) ?? null;
    if (!thickness && !errors['coupon.thickness']) missing.push(d.form === 'pipe' ? 'the wall thickness' : 'the coupon thickness');
    if (d.form === 'pipe') {
      outsideDiameter = take('coupon.outsideDiameter', readLength(d.outsideDiameterText, { positive: true, bounds: lengthBounds.outsideDiameter }));
      if (!outsideDiameter && !errors['coupon.outsideDiameter']) missing.push('the outside diameter');
    }
  }
  const deposited = take('coupon.depositedThickness', readLength(d.depositedText, { positive: true, bounds: lengthBounds.depositedThickness }));

  let layers: number | undefined;
  if (d.layersText.trim() !== '') {
    const n = Number(d.layersText);
    if (!Number.isInteger(n) || n < 1) errors['coupon.layers'] = 'Enter a whole number of layers (1 or more)';
    else layers = n;
  }
  let fNumber: number | undefined;
  if (d.fNumberText.trim() !== '') {
    const n = Number(d.fNumberText.replace(/^f-?(no\.?)?\s*/i, ''));
    if (!Number.isInteger(n) || n < 1 || n > 99) errors['coupon.fNumber'] = 'F-No. is a whole number from 1 to 99';
    else fNumber = n;
  }

  if (!d.code) missing.push('the code');
  if (!d.process) missing.push('the process');
  if (!d.position) missing.push('the test position');
  if (!d.backing) missing.push('whether it had backing');

  if (missing.length > 0 || Object.keys(errors).length > 0 || !thickness || !d.code || !d.process)
    return { coupon: null, errors, missing, thickness, pipe };

  const coupon: CouponInput = {
    code: d.code,
    process: d.process,
    form: d.form,
    weld: d.weld,
    position: d.position,
    thickness,
    backing: d.backing === 'with',
    ...(d.process === 'GMAW' && d.transferMode ? { transferMode: d.transferMode } : {}),
    ...(deposited ? { depositedThickness: deposited } : {}),
    ...(layers !== undefined ? { layers } : {}),
    ...(outsideDiameter ? { outsideDiameter } : {}),
    ...(fNumber !== undefined ? { fNumber } : {}),
    ...(d.progression ? { progression: d.progression } : {}),
  };
  return { coupon, errors, missing, thickness, pipe };
}

// ---- the live analysis ---------------------------------------------------------------------------

export interface VerdictReason {
  clause: string;
  message: string;
  /** 'Specimen 2 (root)', or null for the visual or volumetric examination. */
  where: string | null;
}

export interface DraftAnalysis {
  errors: Errors;
  missing: string[];
  ranges: QualifiedRanges | null;
  proposal: BendSpecimenProposal | null;
  evaluation: BendEvaluation | null;
  /** The verdict the form would claim; null while the examination is incomplete. */
  verdict: Verdict | null;
  reasons: VerdictReason[];
  notes: VerdictReason[];
  /** Why there is no verdict yet. */
  incomplete: string | null;
  /** No verdict because the visual examination or a specimen is not examined yet (not for a typing error). */
  notExamined: boolean;
  /** Each discontinuity's size as read, by its key. */
  sizes: Record<string, ParsedLength>;
}

const KIND_WORDS: Record<SpecimenKind, string> = { face: 'face', root: 'root', side: 'side' };
export const specimenLabel = (s: { kind: SpecimenKind }, index: number): string => `Specimen ${index + 1} (${KIND_WORDS[s.kind]})`;

const RANK: Record<Verdict, number> = { accept: 0, 'replace-specimen': 1, reject: 2 };

function proposalFor(d: CouponDraft, build: CouponBuild): BendSpecimenProposal | null {
  if (!d.code || !d.position || d.weld !== 'groove') return null;
  const deposited = readLength(d.depositedText, { positive: true });
  const t = deposited?.ok ? plain(deposited.length) : build.thickness;
  if (!t) return null;
  try {
    return proposeBendSpecimens({ code: d.code, form: d.form, position: d.position, depositedThickness: t });
  } catch (error) {
    if (error instanceof RulesInputError) return null;
    throw error;
  }
}

export function analyseDraft(d: CouponDraft): DraftAnalysis {
  const build = buildCoupon(d);
  const errors: Errors = { ...build.errors };
  const sizes: Record<string, ParsedLength> = {};

  let ranges: QualifiedRanges | null = null;
  if (build.coupon) {
    try {
      ranges = qualifiedRanges(build.coupon);
    } catch (error) {
      if (!(error instanceof RulesInputError)) throw error;
      Object.assign(errors, prefixed('coupon', error.fields));
    }
  }

  let evaluation: BendEvaluation | null = null;
  let exam: Verdict | null = null;
  let incomplete: string | null = null;
  const reasons: VerdictReason[] = [];
  const notes: VerdictReason[] = [];

  if (d.method === 'bend') {
    let readable = true;
    d.specimens.forEach((s, i) =>
      s.discontinuities.forEach((disc, j) => {
        const read = readLength(disc.sizeText, { bounds: lengthBounds.discontinuity });
        if (read?.ok) sizes[disc.key] = read.length;
        else {
          readable = false;
          if (read && !read.ok) errors[`examination.bend.specimens.${i}.discontinuities.${j}.sizeText`] = read.error;
          incomplete ??= `${specimenLabel(s, i)}, discontinuity ${j + 1}: ${read ? 'the size does not read as a length' : 'enter its size'}.`;
        }
      }),
    );
    if (d.specimens.length === 0) incomplete = 'Add the bend specimens to see the evaluation.';
    else if (readable) {
      try {
        evaluation = evaluateBendTest({
          criteria: d.criteria,
          ...(build.thickness ? { wallThickness: build.thickness } : {}),
          specimens: d.specimens.map((s) => ({
            kind: s.kind,
            discontinuities: s.discontinuities.map((disc) => {
              const size = sizes[disc.key];
              return {
                size: size ? plain(size) : { value: 0, unit: 'in' as const },
                location: disc.location,
                fusionRelated: disc.fusionRelated,
                ...(disc.type ? { type: disc.type } : {}),
              };
            }),
          })),
        });
        // a short or mixed specimen set has no verdict yet (never an accept)
        if (evaluation.result === 'incomplete') incomplete = evaluation.completeness[0]?.message ?? 'The specimen set is incomplete.';
        else exam = evaluation.result;
        evaluation.specimens.forEach((e, i) => {
          const s = d.specimens[i];
          const where = s ? specimenLabel(s, i) : `Specimen ${i + 1}`;
          e.reasons.forEach((r) => reasons.push({ ...r, where }));
          e.notes.forEach((r) => notes.push({ ...r, where }));
        });
      } catch (error) {
        if (!(error instanceof RulesInputError)) throw error;
        if (error.fields.wallThickness) {
          errors['coupon.thickness'] ??= error.fields.wallThickness;
          incomplete = error.fields.wallThickness;
        } else {
          Object.assign(errors, prefixed('examination', error.fields));
          incomplete = firstMessage(error);
        }
      }
    }
  } else if (d.volumetricResult) {
    exam = d.volumetricResult;
    if (exam === 'reject')
      reasons.push({
        clause: `${d.method === 'radiography' ? 'Radiographic' : 'Ultrasonic'} examination report`,
        message: `${d.method === 'radiography' ? 'Radiographic' : 'Ultrasonic'} examination rejected${d.reportNumber ? ` (report ${d.reportNumber})` : ''}`,
        where: null,
      });
  } else {
    incomplete = `Record the ${d.method === 'radiography' ? 'radiography' : 'ultrasonic examination'} result to see the evaluation.`;
  }

  // Nothing is judged before it is examined: the visual examination first, then every specimen.
  const unexamined = d.method === 'bend' ? d.specimens.findIndex((s) => !s.examined) : -1;
  let notExamined = false;
  if (d.visual === '' || unexamined >= 0) {
    notExamined = true;
    exam = null;
    const which = unexamined >= 0 ? d.specimens[unexamined] : undefined;
    incomplete =
      d.visual === ''
        ? 'Record the visual examination; it comes first.'
        : which
          ? `Mark each specimen examined once it is bent and looked at (${specimenLabel(which, unexamined)} is not).`
          : incomplete;
  }

  let verdict = exam;
  if (d.visual === 'reject') {
    reasons.unshift({ clause: 'Visual examination', message: 'Visual examination rejected', where: null });
    verdict = 'reject';
    incomplete = null;
    notExamined = false;
  }
  if (exam && verdict && RANK[exam] > RANK[verdict]) verdict = exam;

  return {
    errors,
    missing: build.missing,
    ranges,
    proposal: proposalFor(d, build),
    evaluation,
    verdict,
    reasons,
    notes,
    incomplete: verdict ? null : incomplete,
    notExamined: verdict ? false : notExamined,
    sizes,
  };
}

/** The specimens of one set of a proposal, in order (face, root, side). */
export function specimensOf(set: BendSpecimenProposal['options'][number]): SpecimenDraft[] {
  return set.flatMap(({ kind, count }) => Array.from({ length: count }, () => newSpecimen(kind)));
}

export const setLabel = (set: BendSpecimenProposal['options'][number]): string =>
  set.map(({ kind, count }) => `${count} ${kind}`).join(' + ');

// ---- what is sent -------------------------------------------------------------------------------

/** The body of POST /api/coupons, checked with its schema; or the errors to show before sending. */
export function toRecordInput(d: CouponDraft, a: DraftAnalysis): { input: CouponRecordInput | null; errors: Errors } {
  const errors: Errors = { ...a.errors };
  if (d.method === 'bend' && d.visual !== 'reject')
    d.specimens.forEach((s, i) => {
      if (!s.examined) errors[`examination.bend.specimens.${i}.examined`] = `Mark ${specimenLabel(s, i)} examined, or remove it`;
    });
  if (d.method === 'bend')
    d.specimens.forEach((s, i) =>
      s.discontinuities.forEach((disc, j) => {
        if (disc.sizeText.trim() === '') errors[`examination.bend.specimens.${i}.discontinuities.${j}.sizeText`] = 'Enter the size, or remove this discontinuity';
      }),
    );
  for (const m of a.missing) {
    if (m === 'the code') errors['coupon.code'] ??= 'Choose the code';
    if (m === 'the process') errors['coupon.process'] ??= 'Choose the process';
    if (m === 'the test position') errors['coupon.position'] ??= 'Choose the test position';
    if (m === 'whether it had backing') errors['coupon.backing'] ??= 'Say whether the coupon was welded with backing';
    if (m === 'the coupon thickness' || m === 'the wall thickness') errors['coupon.thickness'] ??= 'Enter the thickness';
    if (m === 'the outside diameter') errors['coupon.outsideDiameter'] ??= 'Enter the outside diameter';
    if (m === 'the pipe size and schedule') {
      if (!d.nps.trim()) errors['pipe.nps'] ??= 'Enter the NPS';
      if (!d.schedule.trim()) errors['pipe.schedule'] ??= 'Enter the schedule';
    }
  }

  const build = buildCoupon(d);
  const layers = Number(d.layersText);
  const fNumber = Number(d.fNumberText.replace(/^f-?(no\.?)?\s*/i, ''));
  const raw = {
    welderId: d.welderId,
    shopId: d.shopId,
    procedureId: d.procedureId,
    testedOn: d.testedOn,
    coupon: build.coupon ?? {
      code: d.code || undefined,
      process: d.process || undefined,
      form: d.form,
      weld: d.weld,
      position: d.position || undefined,
      thickness: build.thickness ?? undefined,
      backing: d.backing === '' ? undefined : d.backing === 'with',
      ...(d.layersText.trim() && Number.isInteger(layers) ? { layers } : {}),
      ...(d.fNumberText.trim() && Number.isInteger(fNumber) ? { fNumber } : {}),
    },
    pipe: build.pipe,
    pNumbers: d.pNumbersText
      .split(/[,;]/)
      .map((p) => p.trim())
      .filter(Boolean),
    examiner: { name: d.examinerName, certificateNumber: d.examinerCertificate },
    labReportNumber: d.labReportNumber,
    visual: d.visual || undefined,
    examination:
      d.method === 'bend'
        ? {
            criteria: d.criteria,
            bend: {
              specimens: d.specimens.map((s, i) => ({
                label: specimenLabel(s, i),
                kind: s.kind,
                photoUploadId: s.photo?.id ?? null,
                discontinuities: s.discontinuities.map((disc) => {
                  const size = a.sizes[disc.key];
                  return {
                    sizeText: disc.sizeText.trim(),
                    size: size ? plain(size) : undefined,
                    location: disc.location,
                    fusionRelated: disc.fusionRelated,
                    ...(disc.type ? { type: disc.type } : {}),
                  };
                }),
              })),
            },
          }
        : {
            volumetric: {
              method: d.method,
              indications: [],
              examinerResult: d.volumetricResult || undefined,
              ...(d.reportNumber.trim() ? { reportNumber: d.reportNumber.trim() } : {}),
              reportUploadId: d.report?.id ?? null,
            },
          },
    ...(a.verdict ? { claimedResult: a.verdict } : {}),
    notes: d.notes,
  };
  const parsed = couponRecordInput.safeParse(raw);
  if (!parsed.success) {
    for (const [k, v] of Object.entries(fieldsOf(parsed.error))) {
      // A size that did not read already has its message at sizeText.
      if (/\.discontinuities\.\d+\.size(\.|$)/.test(k) && errors[k.replace(/\.size(\..*)?$/, '.sizeText')]) continue;
      if (!errorFor(errors, k)) errors[k] = v;
    }
  }
  if (Object.keys(errors).length > 0) return { input: null, errors };
  return { input: raw as CouponRecordInput, errors: {} };
}
