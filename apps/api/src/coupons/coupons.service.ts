// Coupons: recording a welder's qualification test, its examination and the server's verdict; editing it
// until it is certified. One transaction per write, with its audit event.
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import {
  RETEST_RULES,
  failedKindOf,
  couponRecordSchema,
  type CodeId,
  upgradeExamination,
  type CouponRecord,
  type couponListQuery,
  type couponRecordInput,
  type couponUpdateInput,
  type Upload,
} from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { companyToday } from '../settings/settings.repository.js';
import { companyShops } from '../shops/shops.service.js';
import { checkAttachments, uploadsById } from '../uploads/uploads.service.js';
import { procedureForCoupon } from '../procedures/procedures.repository.js';
import { attachmentRefs, evaluateCoupon, procedureProblem, type CouponFields, type StoredExamination } from './coupon-evaluation.js';
import { refreshContinuityPairs } from '../continuity/continuity-state.repository.js';
import * as repo from './coupons.repository.js';
import { retestSetOf, type RetestSet } from './retest-sets.js';
import { CODE_NAMES } from '../documents/document-format.js';

type CreateInput = z.output<typeof couponRecordInput>;
type UpdateInput = z.output<typeof couponUpdateInput>;
type ListQuery = z.output<typeof couponListQuery>;

const STALE =
  'Someone else changed this coupon since you opened it; reload to see their change and try again';
export const CERTIFIED_LOCKED = 'Certified coupons cannot be edited; record a new coupon';

function uploadIdsOf(rows: repo.CouponRaw[]): string[] {
  return rows.flatMap((r) => {
    const ex = upgradeExamination(r.examination) as repo.CouponRaw['examination'];
    return [
      ...(ex.bend?.specimens ?? []).flatMap((s) => (s.photoUploadId ? [s.photoUploadId] : [])),
      ...(ex.volumetric?.reportUploadId ? [ex.volumetric.reportUploadId] : []),
    ];
  });
}

function toRecord(r: repo.CouponRaw, uploads: Map<string, Upload>, retestRows: repo.RetestRow[]): CouponRecord {
  // rows written in the first shape ({ method, … }) by tools that insert directly are read in the current one
  const { visualFindings, ...ex } = upgradeExamination(r.examination) as repo.CouponRaw['examination'];
  const upload = (id: string | null | undefined) => (id && uploads.get(id)) || null;
  const examination = {
    ...ex,
    ...(ex.bend
      ? { bend: { specimens: ex.bend.specimens.map((s) => ({ ...s, photo: upload(s.photoUploadId) })) } }
      : {}),
    ...(ex.volumetric ? { volumetric: { ...ex.volumetric, report: upload(ex.volumetric.reportUploadId) } } : {}),
  };
  const basis = ex.retest?.basis;
  const retestSet =
    r.retestOfId && basis
      ? retestSetOf(
          r.coupon.code as CodeId,
          retestRows.filter((x) => x.retestOfId === r.retestOfId),
          { id: r.id, basis, result: r.result, testedOn: r.testedOn },
        )
      : null;
  return couponRecordSchema.parse({
    ...r,
    visualFindings: visualFindings ?? [],
    examination,
    retestSet: retestSet ? { verdict: retestSet.verdict, coupons: retestSet.coupons } : null,
    retests: retestRows
      .filter((x) => x.retestOfId === r.id)
      .map(({ id, testedOn, basis: b, result }) => ({ id, testedOn, basis: b, result })),
    createdAt: r.createdAt.toISOString(),
  });
}

async function toRecords(db: EntityManager, actor: Actor, rows: repo.CouponRaw[]): Promise<CouponRecord[]> {
  const uploads = await uploadsById(db, actor.organizationId, uploadIdsOf(rows));
  // the retests of the failed coupons listed, and the other coupons of each listed retest
  const failedIds = [...new Set(rows.flatMap((r) => [r.id, ...(r.retestOfId ? [r.retestOfId] : [])]))];
  const retestRows = await repo.retestsOf(db, failedIds);
  return rows.map((r) => toRecord(r, uploads, retestRows));
}

export async function listCoupons(deps: AppDeps, actor: Actor, q: ListQuery) {
  const db = deps.dataSource.manager;
  return { items: await toRecords(db, actor, await repo.listCoupons(db, actor, q)) };
}

export async function getCoupon(
  deps: AppDeps,
  actor: Actor,
  id: string,
  db: EntityManager = deps.dataSource.manager,
): Promise<CouponRecord> {
  const row = isUuid(id) ? await repo.findCoupon(db, actor, id) : null;
  if (!row) throw AppError.notFound('coupon');
  const [record] = await toRecords(db, actor, [row]);
  return record!;
}

/**
 * A retest names the failed coupon it retests (QW-321, D1.1 retest, API 1104 retest): a rejected coupon of
 * the same welder, code, process and position, tested on or before it. What failed, its date, the
 * immediate retests already made of it and the verdicts of the other coupons of the same retest are taken
 * from the records, never from the request.
 */
async function linkRetest(
  db: EntityManager,
  actor: Actor,
  input: CouponFields,
  welderId: string,
  couponId: string | null,
): Promise<{ fields: CouponFields; retestOfId: string | null }> {
  const retest = input.examination.retest;
  if (!retest) return { fields: input, retestOfId: null };
  const failed =
    isUuid(retest.of) && retest.of !== couponId
      ? await repo.failedCouponOf(db, actor.organizationId, welderId, retest.of)
      : null;
  if (!failed)
    throw AppError.validation({ 'examination.retest.of': 'Name a rejected coupon of this welder: the test this one retests' });
  const code = input.coupon.code;
  const option = retest.basis === 'immediate' ? RETEST_RULES[code].immediate : RETEST_RULES[code].afterTraining;
  const fields: Record<string, string> = {};
  if (failed.code !== code || failed.process !== input.coupon.process)
    fields['examination.retest.of'] =
      `The failed coupon is a ${CODE_NAMES[failed.code as CodeId] ?? failed.code} ${failed.process} test: a retest is made with the same code and process (${option.clause})`;
  else if (failed.position !== input.coupon.position)
    fields['coupon.position'] =
      `A retest is made in the position failed, ${failed.position} (${option.clause})`;
  if (input.testedOn < failed.testedOn)
    fields.testedOn = `A retest comes after the failed test of ${failed.testedOn}`;
  if (Object.keys(fields).length > 0) throw AppError.validation(fields, 'The retest does not match the failed test');

  const own = { id: couponId ?? 'new', basis: retest.basis, result: 'accept' as const, testedOn: input.testedOn };
  const set = retestSetOf(code, await repo.retestsOf(db, [failed.id]), own);
  return {
    fields: {
      ...input,
      examination: {
        ...input.examination,
        retest: {
          ...retest,
          failedOn: failed.testedOn,
          failedKind: failedKindOf(failed),
          priorRetests: set.priorSets,
          companions: set.coupons.filter((c) => c.id !== own.id).map((c) => c.result),
        },
      },
    },
    retestOfId: failed.id,
  };
}

/** Every check against the company's records, then the evaluation: the row to write. */
async function prepare(
  deps: AppDeps,
  db: EntityManager,
  actor: Actor,
  input: CouponFields,
  welderId: string,
  couponId: string | null,
): Promise<{ write: repo.CouponWrite; uploadIds: string[] }> {
  const fields: Record<string, string> = {};
  const [shop] = await companyShops(db, actor, [input.shopId]);
  if (!shop) fields.shopId = 'Choose a shop of your company';
  const procedure = await procedureForCoupon(db, actor.organizationId, input.procedureId);
  const problem = procedure
    ? procedureProblem(procedure, input.coupon, input.examination.layers ?? [])
    : 'Choose a WPS from your company’s register';
  if (problem) fields.procedureId = problem;
  if (input.testedOn > (await companyToday(db, actor, deps.clock))) fields.testedOn = 'The test date cannot be in the future';
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);

  const linked = await linkRetest(db, actor, input, welderId, couponId);
  const evaluation = evaluateCoupon(linked.fields);
  const refs = attachmentRefs(input);
  await checkAttachments(db, actor, refs, deps.clock.now());
  return {
    write: {
      shopId: input.shopId,
      procedureId: input.procedureId,
      testedOn: input.testedOn,
      code: evaluation.coupon.code,
      process: evaluation.coupon.process,
      coupon: evaluation.coupon,
      pipe: input.pipe ?? null,
      pNumbers: input.pNumbers,
      examiner: input.examiner,
      labReportNumber: input.labReportNumber,
      visual: input.visual.result,
      examination: evaluation.examination,
      result: evaluation.result,
      reasons: evaluation.reasons,
      criteriaId: evaluation.criteriaId,
      additionalCriteriaId: evaluation.additionalCriteriaId,
      evaluation: evaluation.evaluation,
      rulesVersion: evaluation.rulesVersion,
      retestOfId: linked.retestOfId,
      notes: input.notes,
    },
    uploadIds: refs.map((r) => r.id),
  };
}

/** Every process a coupon was welded with (a combination coupon's layers too, QW-306): it is evidence for each. */
const processesOf = (w: repo.CouponWrite): string[] => [
  ...new Set([w.process, ...((w.examination as StoredExamination).layers ?? []).map((l) => l.process)]),
];

/** The audit snapshot of a coupon: the same JSON shape the database hands back. */
const snapshot = (w: repo.CouponWrite): Record<string, unknown> =>
  JSON.parse(JSON.stringify(w)) as Record<string, unknown>;

export async function createCoupon(deps: AppDeps, actor: Actor, input: CreateInput): Promise<CouponRecord> {
  const id = await deps.dataSource.transaction(async (db) => {
    const { welderId, ...fields } = input;
    if (!(await repo.welderOfOrganization(db, actor.organizationId, welderId)))
      throw AppError.validation({ welderId: 'Choose a welder of your company' });
    const { write, uploadIds } = await prepare(deps, db, actor, fields, welderId, null);
    const now = deps.clock.now();
    const couponId = await repo.insertCoupon(db, {
      ...write,
      organizationId: actor.organizationId,
      welderId,
      recordedBy: actor.id,
      at: now,
    });
    await repo.replaceCouponUploads(db, couponId, uploadIds);
    // A passing coupon is continuity evidence for its process on its date (every code the welder holds).
    await recordLapseMoves(db, await refreshContinuityPairs(db, processesOf(write).map((process) => ({ welderId, process }))), deps.clock);
    await recordAudit(db, actor, now, {
      action: 'coupon.created',
      entityType: 'coupon',
      entityId: couponId,
      before: null,
      after: { welderId, ...snapshot(write) },
    });
    return couponId;
  });
  return getCoupon(deps, actor, id);
}

export async function updateCoupon(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: UpdateInput,
): Promise<CouponRecord> {
  if (!isUuid(id)) throw AppError.notFound('coupon');
  await deps.dataSource.transaction(async (db) => {
    const current = await repo.lockCoupon(db, actor.organizationId, id);
    if (!current) throw AppError.notFound('coupon');
    if (current.qualificationId) throw AppError.conflict(CERTIFIED_LOCKED);
    if (current.version !== input.version) throw AppError.conflict(STALE);
    const { version: _v, ...fields } = input;
    const { write, uploadIds } = await prepare(deps, db, actor, fields, current.welderId, id);
    const changes = diff(current.snapshot, snapshot(write));
    if (changes.changed.length === 0) return;
    const now = deps.clock.now();
    if (!(await repo.updateCoupon(db, id, current.version, write, now))) throw AppError.conflict(STALE);
    await repo.replaceCouponUploads(db, id, uploadIds);
    // the processes the coupon is evidence for, before and after the edit
    const moved = [...new Set([...processesOf(write), ...current.processes])];
    await recordLapseMoves(db, await refreshContinuityPairs(db, moved.map((process) => ({ welderId: current.welderId, process }))), deps.clock);
    await recordAudit(db, actor, now, {
      action: 'coupon.updated',
      entityType: 'coupon',
      entityId: id,
      before: changes.before,
      after: changes.after,
    });
  });
  return getCoupon(deps, actor, id);
}

/** For certification (qualifications feature): the coupon locked in the caller's transaction. */
export async function lockCouponForCertification(db: EntityManager, actor: Actor, id: string) {
  const coupon = isUuid(id) ? await repo.lockCoupon(db, actor.organizationId, id) : null;
  if (!coupon) throw AppError.notFound('coupon');
  return coupon;
}

export { passingTestDatesSql } from './coupons.repository.js';

/**
 * For certification: a retest is certified only when the retest as a whole passed (an immediate retest of
 * two coupons, both passing), and once — from one coupon of the set.
 */
export async function retestSetForCertification(
  db: EntityManager,
  coupon: { id: string; code: string; result: string; testedOn: string; retestOfId: string | null; basis: string | null },
): Promise<RetestSet | null> {
  if (!coupon.retestOfId || (coupon.basis !== 'immediate' && coupon.basis !== 'after-training')) return null;
  return retestSetOf(coupon.code as CodeId, await repo.retestsOf(db, [coupon.retestOfId]), {
    id: coupon.id,
    basis: coupon.basis,
    result: coupon.result as RetestSet['coupons'][number]['result'],
    testedOn: coupon.testedOn,
  });
}
