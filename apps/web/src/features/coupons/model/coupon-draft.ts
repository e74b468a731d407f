// The coupon form's state and everything the browser computes from it while it is filled in: the
// lengths read from what was typed, the pipe's OD and wall from NPS and schedule, the proposed bend
// specimens, the live verdict (evaluateCoupon on the whole coupon, the same rules the server runs) and the qualified
// ranges preview. Pure functions, so the component tests and the form agree on every answer.
// Error keys are the API's dotted paths (coupon.thickness, examination.bend.specimens.0.discontinuities.1.size),
// so a 400 from the server lands on the same fields as the live checks.
import { PART_NAMES } from './examination-words';
import { firstMessage, readLength, type LengthRead } from '@/lib/lengths';
import {
  couponRecordInput,
  evaluateCoupon,
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
  retestSetOf,
  failedKindOf,
  type BendSpecimenProposal,
  type CouponEvaluation,
  type CouponEvaluationInput,
  type IndicationType,
  type VisualFindingType,
  type CodeId,
  type CouponInput,
  type CouponRecord,
  type CouponRecordInput,
  type RetestBasis,
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
  type CouponResult,
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

export interface FindingDraft {
  key: string;
  type: VisualFindingType | '';
  sizeText: string;
}

export interface IndicationDraft {
  key: string;
  type: IndicationType | '';
  sizeText: string;
}

export interface NickBreakDraft {
  key: string;
  examined: boolean;
  /** The fracture shows complete penetration and fusion. */
  sound: 'yes' | 'no' | '';
  /** Greatest dimension of each gas pocket, separated by commas ('1/16, 1 mm'). */
  gasPocketsText: string;
}

export interface LayerDraft {
  key: string;
  process: Process | '';
  depositedText: string;
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
  visualFindings: FindingDraft[];
  method: 'bend' | 'radiography' | 'ultrasonic';
  criteria: CriteriaId;
  /** False until the person changes the set of specimens; until then the form follows the proposal. */
  specimensChosen: boolean;
  specimens: SpecimenDraft[];
  volumetricResult: 'accept' | 'reject' | '';
  /** The radiographs or the ultrasonic record are read and every indication entered. */
  volumetricExamined: boolean;
  indications: IndicationDraft[];
  reportNumber: string;
  report: Upload | null;
  /** Fillet coupons: the fillet weld break and the macro-etch section. */
  filletBreak: { examined: boolean; bentFlat: 'yes' | 'no' | ''; crack: boolean; incompleteRootFusion: boolean; inclusionsText: string };
  macro: { examined: boolean; completeFusion: 'yes' | 'no' | ''; crack: boolean; leg1Text: string; leg2Text: string; convexityText: string; concavityText: string };
  /** API 1104: nick-break specimens, besides the bends. */
  nickBreaks: NickBreakDraft[];
  /** A combination coupon: each process with the weld metal it deposited, root first (QW-306). */
  combination: boolean;
  layers: LayerDraft[];
  /** A retest: the failed coupon it retests (the coupon page's "Record a retest" passes it) and its kind. */
  retestOf: RetestTarget | null;
  retestBasis: RetestBasis | '';
  notes: string;
}

/** The failed coupon a retest names, with the retests already recorded of it (in the order tested). */
export type RetestTarget = Pick<CouponRecord, 'id' | 'welder' | 'testedOn' | 'coupon' | 'reasons' | 'retests' | 'visual' | 'evaluation'>;

let counter = 0;
export const newKey = (): string => `k${(counter += 1)}`;

export const newDiscontinuity = (): DiscontinuityDraft => ({
  key: newKey(),
  sizeText: '',
  location: 'surface',
  type: '',
  fusionRelated: false,
});

export const newFinding = (): FindingDraft => ({ key: newKey(), type: '', sizeText: '' });
export const newIndication = (): IndicationDraft => ({ key: newKey(), type: '', sizeText: '' });
export const newNickBreak = (): NickBreakDraft => ({ key: newKey(), examined: false, sound: '', gasPocketsText: '' });
export const newLayer = (process: Process | '' = ''): LayerDraft => ({ key: newKey(), process, depositedText: '' });

export const newSpecimen = (kind: SpecimenKind): SpecimenDraft => ({ key: newKey(), kind, examined: false, discontinuities: [], photo: null });

export const todayIso = (): string => new Date().toISOString().slice(0, 10);

export interface DraftPrefill {
  /** The failed coupon a retest names; its welder, code, process, position and form are the retest's. */
  retestOf?: RetestTarget;
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
  const failed = prefill.retestOf?.coupon;
  if (failed) prefill = { ...prefill, welderId: prefill.retestOf?.welder.id, code: failed.code, process: failed.process, position: failed.position, form: failed.form };
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
    visualFindings: [],
    method: 'bend',
    criteria: code || 'asme-ix',
    specimensChosen: false,
    specimens: [],
    volumetricResult: '',
    volumetricExamined: false,
    indications: [],
    reportNumber: '',
    report: null,
    filletBreak: { examined: false, bentFlat: '', crack: false, incompleteRootFusion: false, inclusionsText: '' },
    macro: { examined: false, completeFusion: '', crack: false, leg1Text: '', leg2Text: '', convexityText: '', concavityText: '' },
    nickBreaks: [],
    combination: false,
    layers: [],
    retestOf: prefill.retestOf ?? null,
    retestBasis: '',
    notes: '',
  };
}

/**
 * The retest as the server will link it: the other coupons of the same retest (an immediate retest of two
 * coupons is the next two immediate coupons of the failed one) and the immediate retests made before it.
 */
export function retestLink(d: Pick<CouponDraft, 'retestOf' | 'retestBasis' | 'code'>, own: CouponResult = 'accept') {
  if (!d.retestOf || !d.retestBasis || !d.code) return null;
  const rows = d.retestOf.retests.map((r) => ({ id: r.id, basis: r.basis, result: r.result }));
  const set = retestSetOf(d.code, rows, { id: 'this coupon', basis: d.retestBasis, result: own });
  return {
    of: d.retestOf.id,
    basis: d.retestBasis,
    failedOn: d.retestOf.testedOn,
    failedKind: failedKindOf(d.retestOf),
    priorRetests: set.priorSets,
    companions: set.coupons.filter((c) => c.id !== 'this coupon').map((c) => c.result),
    set,
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
  /** The whole examination as the rules judge it (the same evaluateCoupon the server runs). */
  evaluation: CouponEvaluation | null;
  /** The verdict the form would claim; null while the examination is incomplete. */
  verdict: Verdict | null;
  reasons: VerdictReason[];
  notes: VerdictReason[];
  /** Why there is no verdict yet. */
  incomplete: string | null;
  /** No verdict because the visual examination or a specimen is not examined yet (not for a typing error). */
  notExamined: boolean;
  /** Each size typed in the examination (discontinuities, findings, indications…) as read, by its key. */
  sizes: Record<string, ParsedLength>;
  /** The examination as the request sends it (sizes as typed and as read). */
  examination: Record<string, unknown>;
}

const KIND_WORDS: Record<SpecimenKind, string> = { face: 'face', root: 'root', side: 'side' };
export const specimenLabel = (s: { kind: SpecimenKind }, index: number): string => `Specimen ${index + 1} (${KIND_WORDS[s.kind]})`;

/** Which parts of the examination the form records for this coupon. */
export function partsOf(d: Pick<CouponDraft, 'weld' | 'position' | 'method' | 'code'>) {
  const fillet = d.weld === 'fillet' || /F$|FR$/i.test(d.position.trim());
  return {
    fillet,
    bend: !fillet && d.method === 'bend',
    volumetric: !fillet && d.method !== 'bend',
    nickBreak: !fillet && d.code === 'api-1104',
  };
}

/** A list of sizes typed with commas or semicolons ('1/16, 1 mm'), each read; errors at the field. */
function readList(text: string, at: string, errors: Errors): Length[] {
  const out: Length[] = [];
  text
    .split(/[;,]/)
    .map((t) => t.trim())
    .filter(Boolean)
    .forEach((t) => {
      const read = readLength(t, { bounds: lengthBounds.discontinuity });
      if (read?.ok) out.push(plain(read.length));
      else if (read) errors[at] ??= `${t}: ${read.error}`;
    });
  return out;
}

/** Reads one typed size into `sizes`; an unreadable one is an error at its field. */
function readInto(text: string, key: string, at: string, errors: Errors, sizes: Record<string, ParsedLength>, positive = false): Length | undefined {
  const read = readLength(text, { positive, bounds: lengthBounds.discontinuity });
  if (read === null) return undefined;
  if (!read.ok) {
    errors[at] = read.error;
    return undefined;
  }
  sizes[key] = read.length;
  return plain(read.length);
}

/** The examination as recorded: what the request sends, and what evaluateCoupon reads. */
function examinationOf(d: CouponDraft, errors: Errors, sizes: Record<string, ParsedLength>) {
  const parts = partsOf(d);
  // the code's own criteria always; an in-house set only in addition (never instead)
  const ex: Record<string, unknown> = {
    criteria: d.code || undefined,
    ...(d.criteria === 'shop-general' ? { additionalCriteria: 'shop-general' } : {}),
  };
  const unread: string[] = [];
  if (parts.bend) {
    ex.bend = {
      specimens: d.specimens.map((s, i) => ({
        // the mark on the specimen: F1, R2, S1 (kind and place in the set)
        label: `${s.kind[0]?.toUpperCase() ?? ''}${i + 1}`,
        kind: s.kind,
        photoUploadId: s.photo?.id ?? null,
        discontinuities: s.discontinuities.map((disc, j) => {
          const at = `examination.bend.specimens.${i}.discontinuities.${j}.sizeText`;
          const size = readInto(disc.sizeText, disc.key, at, errors, sizes);
          if (!size) unread.push(`${specimenLabel(s, i)}, discontinuity ${j + 1}: ${disc.sizeText.trim() ? 'the size does not read as a length' : 'enter its size'}.`);
          return {
            sizeText: disc.sizeText.trim(),
            size,
            location: disc.location,
            fusionRelated: disc.fusionRelated,
            ...(disc.type ? { type: disc.type } : {}),
          };
        }),
      })),
    };
  }
  if (parts.volumetric)
    ex.volumetric = {
      method: d.method,
      indications: d.indications.map((x, i) => {
        const size = readInto(x.sizeText, x.key, `examination.volumetric.indications.${i}.size`, errors, sizes, true);
        if (!size || !x.type) unread.push(`Indication ${i + 1}: ${x.type ? 'enter its size' : 'choose its type'}.`);
        return { type: x.type || undefined, size };
      }),
      examinerResult: d.volumetricResult || undefined,
      ...(d.reportNumber.trim() ? { reportNumber: d.reportNumber.trim() } : {}),
      reportUploadId: d.report?.id ?? null,
    };
  if (parts.fillet && d.filletBreak.examined)
    ex.filletBreak = {
      bentFlat: d.filletBreak.bentFlat === '' ? undefined : d.filletBreak.bentFlat === 'yes',
      crack: d.filletBreak.crack,
      incompleteRootFusion: d.filletBreak.incompleteRootFusion,
      inclusions: readList(d.filletBreak.inclusionsText, 'examination.filletBreak.inclusions', errors),
    };
  if (parts.fillet && d.macro.examined) {
    const m = d.macro;
    const leg1 = readInto(m.leg1Text, 'macro.leg1', 'examination.macroEtch.legs.0', errors, sizes, true);
    const leg2 = readInto(m.leg2Text, 'macro.leg2', 'examination.macroEtch.legs.1', errors, sizes, true);
    const convexity = readInto(m.convexityText, 'macro.convexity', 'examination.macroEtch.convexity', errors, sizes);
    const concavity = readInto(m.concavityText, 'macro.concavity', 'examination.macroEtch.concavity', errors, sizes);
    ex.macroEtch = {
      completeFusion: m.completeFusion === '' ? undefined : m.completeFusion === 'yes',
      crack: m.crack,
      ...(leg1 && leg2 ? { legs: [leg1, leg2] } : {}),
      ...(convexity ? { convexity } : {}),
      ...(concavity ? { concavity } : {}),
    };
  }
  if (parts.nickBreak && d.nickBreaks.length > 0)
    ex.nickBreak = {
      specimens: d.nickBreaks.map((n, i) => ({
        id: `Nick-break ${i + 1}`,
        completePenetrationAndFusion: n.sound === '' ? undefined : n.sound === 'yes',
        gasPockets: readList(n.gasPocketsText, `examination.nickBreak.specimens.${i}.gasPockets`, errors),
      })),
    };
  const retest = retestLink(d);
  if (d.retestOf)
    ex.retest = retest
      ? { of: retest.of, basis: retest.basis, failedOn: retest.failedOn, failedKind: retest.failedKind, priorRetests: retest.priorRetests, companions: retest.companions }
      : { of: d.retestOf.id, basis: undefined };
  if (d.combination)
    ex.layers = d.layers.map((l, i) => ({
      process: l.process || undefined,
      depositedThickness: readInto(l.depositedText, `layer.${l.key}`, `examination.layers.${i}.depositedThickness`, errors, sizes, true),
    }));
  return { ex, unread };
}

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

/** What is not yet examined, in the order the examination goes; null when everything is. */
function notYetExamined(d: CouponDraft): string | null {
  if (d.visual === '') return 'Record the visual examination; it comes first.';
  const parts = partsOf(d);
  if (parts.bend) {
    const i = d.specimens.findIndex((s) => !s.examined);
    const s = d.specimens[i];
    if (s) return `Mark each specimen examined once it is bent and looked at (${specimenLabel(s, i)} is not).`;
  }
  if (parts.volumetric && !d.volumetricExamined)
    return `Mark the ${d.method === 'radiography' ? 'radiographs' : 'ultrasonic record'} examined once every indication is entered.`;
  if (parts.fillet && !d.filletBreak.examined) return 'Mark the fillet weld break examined once the specimen is broken and looked at.';
  if (parts.fillet && !d.macro.examined && (d.code === 'asme-ix' || d.code === 'aws-d1.1')) return 'Mark the macro-etch examined once the section is etched and looked at.';
  if (parts.nickBreak) {
    const i = d.nickBreaks.findIndex((n) => !n.examined);
    if (i >= 0) return `Mark each nick-break examined once it is broken and looked at (Nick-break ${i + 1} is not).`;
  }
  return null;
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

  const findings = d.visualFindings.map((f, i) => {
    const size = readInto(f.sizeText, f.key, `visual.findings.${i}.size`, errors, sizes);
    return { type: f.type || undefined, ...(size ? { size } : {}) };
  });
  const { ex, unread } = examinationOf(d, errors, sizes);

  let evaluation: CouponEvaluation | null = null;
  let incomplete: string | null = null;
  const reasons: VerdictReason[] = [];
  const notes: VerdictReason[] = [];
  const waiting = notYetExamined(d);

  if (d.visual !== '' && findings.some((f) => !f.type)) incomplete = 'Choose the type of each visual finding.';
  else if (partsOf(d).bend && d.specimens.length === 0 && d.visual !== 'reject') incomplete = 'Add the bend specimens to see the evaluation.';
  else if (unread[0] && d.visual !== 'reject') incomplete = unread[0];
  else if (!build.coupon || ranges === null) incomplete = build.missing.length > 0 ? `Enter ${build.missing.join(', ')} to see the evaluation.` : 'Fix the fields marked in red to see the evaluation.';
  else if (d.visual !== '' && (waiting === null || d.visual === 'reject')) {
    try {
      evaluation = evaluateCoupon({
        ...(ex as Omit<CouponEvaluationInput, 'coupon' | 'visual'>),
        coupon: build.coupon,
        visual: { result: d.visual, findings: findings as NonNullable<CouponEvaluationInput['visual']['findings']> },
      });
    } catch (error) {
      if (!(error instanceof RulesInputError)) throw error;
      for (const [k, v] of Object.entries(error.fields)) {
        const key = k === '' ? 'examination' : /^(coupon|visual)(\.|$)/.test(k) ? k : `examination.${k}`;
        errors[key] ??= v;
      }
      incomplete = firstMessage(error);
    }
  }

  if (evaluation) {
    for (const part of evaluation.parts) {
      const name = PART_NAMES[part.kind];
      if (part.kind === 'bend' && part.items) {
        // the specimens' own reasons come first in the part's list, the set's completeness after them
        part.items.forEach((item, i) => {
          const s = d.specimens[i];
          item.reasons.forEach((r) => reasons.push({ ...r, where: s ? specimenLabel(s, i) : name }));
        });
        const own = part.items.reduce((n, item) => n + item.reasons.length, 0);
        part.reasons.slice(own).forEach((r) => reasons.push({ ...r, where: name }));
      } else part.reasons.forEach((r) => reasons.push({ ...r, where: part.kind === 'visual' ? null : name }));
      part.notes.forEach((r) => notes.push({ ...r, where: part.kind === 'visual' ? null : name }));
    }
    if (evaluation.result === 'incomplete') incomplete = reasons.map((r) => `${r.message} (${r.clause})`).join(' ') || 'The examination is incomplete.';
  }
  const verdict: Verdict | null = evaluation && evaluation.result !== 'incomplete' ? evaluation.result : null;
  const notExamined = !verdict && waiting !== null && d.visual !== 'reject';

  return {
    errors,
    missing: build.missing,
    ranges,
    proposal: proposalFor(d, build),
    evaluation,
    verdict,
    reasons,
    notes,
    incomplete: verdict ? null : notExamined ? waiting : incomplete,
    notExamined,
    sizes,
    examination: ex,
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
  if (partsOf(d).bend && d.visual !== 'reject')
    d.specimens.forEach((s, i) => {
      if (!s.examined) errors[`examination.bend.specimens.${i}.examined`] = `Mark ${specimenLabel(s, i)} examined, or remove it`;
    });
  if (partsOf(d).bend)
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
    visual: d.visual
      ? {
          result: d.visual,
          findings: d.visualFindings.map((f) => {
            const size = a.sizes[f.key];
            return { type: f.type || undefined, ...(size ? { size: plain(size) } : {}) };
          }),
        }
      : undefined,
    examination: a.examination,
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
