// Coupons: recording a welder's qualification test, its examination and the server's verdict; editing it
// until it is certified. One transaction per write, with its audit event.
import { recordLapseMoves } from '../lapse-watch/lapse-events.js';
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import {
  couponRecordSchema,
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
import { attachmentRefs, evaluateCoupon, procedureProblem, type CouponFields } from './coupon-evaluation.js';
import { refreshContinuityStates } from '../continuity/continuity-state.repository.js';
import * as repo from './coupons.repository.js';

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

function toRecord(r: repo.CouponRaw, uploads: Map<string, Upload>): CouponRecord {
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
  return couponRecordSchema.parse({
    ...r,
    visualFindings: visualFindings ?? [],
    examination,
    createdAt: r.createdAt.toISOString(),
  });
}

async function toRecords(db: EntityManager, actor: Actor, rows: repo.CouponRaw[]): Promise<CouponRecord[]> {
  const uploads = await uploadsById(db, actor.organizationId, uploadIdsOf(rows));
  return rows.map((r) => toRecord(r, uploads));
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
 * A retest names the failed coupon it retests (QW-321, D1.1 retest, API 1104 retest): it must be a
 * rejected coupon of the same welder; its date, the retests already made of it and the verdicts of the
 * other coupons of an immediate retest are taken from the records, never from the request.
 */
async function linkRetest(
  db: EntityManager,
  actor: Actor,
  input: CouponFields,
  welderId: string,
  couponId: string | null,
): Promise<CouponFields> {
  const retest = input.examination.retest;
  if (!retest) return input;
  const failed = isUuid(retest.of) ? await repo.failedCouponOf(db, actor.organizationId, welderId, retest.of) : null;
  if (!failed)
    throw AppError.validation({ 'examination.retest.of': 'Name a rejected coupon of this welder: the test this one retests' });
  const others = await repo.retestsOf(db, retest.of, couponId);
  return {
    ...input,
    examination: {
      ...input.examination,
      retest: {
        ...retest,
        failedOn: failed.testedOn,
        priorRetests: others.filter((o) => o.basis === 'immediate').length,
        companions: others.filter((o) => o.basis === 'immediate').map((o) => o.result),
      },
    },
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
    ? procedureProblem(procedure, input.coupon)
    : 'Choose a WPS from your company’s register';
  if (problem) fields.procedureId = problem;
  if (input.testedOn > (await companyToday(db, actor, deps.clock))) fields.testedOn = 'The test date cannot be in the future';
  if (Object.keys(fields).length > 0) throw AppError.validation(fields);

  const evaluation = evaluateCoupon(await linkRetest(db, actor, input, welderId, couponId));
  const refs = attachmentRefs(input);
  await checkAttachments(db, actor, refs);
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
      notes: input.notes,
    },
    uploadIds: refs.map((r) => r.id),
  };
}

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
    await recordLapseMoves(db, await refreshContinuityStates(db, welderId, write.process), deps.clock);
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
    await recordLapseMoves(db, await refreshContinuityStates(db, current.welderId, write.process), deps.clock);
    if (current.process !== write.process)
      await recordLapseMoves(db, await refreshContinuityStates(db, current.welderId, current.process), deps.clock);
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
