// Coupons in PostgreSQL: scoped through their welder (lib/scope), one query per list plus one for the
// uploads the listed coupons refer to.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { couponListQuery } from '@beadroll/rules';
import { scopeWelders, type Actor } from '../lib/scope.js';
import { CouponEntity, CouponUploadEntity, type CouponRow } from './coupon.entity.js';
import type { Reason, StoredExamination } from './coupon-evaluation.js';

type ListQuery = z.output<typeof couponListQuery>;

export interface CouponRaw {
  id: string;
  welder: { id: string; name: string; stamp: string };
  shop: { id: string; name: string; code: string };
  procedure: { id: string; number: string; revision: string };
  testedOn: string;
  coupon: Record<string, unknown>;
  pipe: { nps: string; schedule: string } | null;
  pNumbers: string[];
  examiner: { name: string; certificateNumber: string };
  labReportNumber: string;
  visual: 'accept' | 'reject';
  examination: StoredExamination;
  result: 'accept' | 'reject' | 'replace-specimen';
  reasons: Reason[];
  criteriaId: string | null;
  additionalCriteriaId: string | null;
  evaluation: unknown;
  rulesVersion: string;
  qualificationId: string | null;
  retestOfId: string | null;
  notes: string;
  version: number;
  createdAt: Date;
  recordedBy: { id: string; name: string } | null;
}

function couponsQuery(db: EntityManager, actor: Actor) {
  const qb = db
    .createQueryBuilder()
    .from(CouponEntity, 'c')
    .innerJoin('Welder', 'w', 'w.id = c.welder_id')
    .innerJoin('Shop', 's', 's.id = c.shop_id')
    .innerJoin('Procedure', 'p', 'p.id = c.procedure_id')
    .leftJoin('User', 'r', 'r.id = c.recorded_by')
    .select('c.id', 'id')
    .addSelect(`json_build_object('id', w.id, 'name', w.name, 'stamp', w.stamp)`, 'welder')
    .addSelect(`json_build_object('id', s.id, 'name', s.name, 'code', s.code)`, 'shop')
    .addSelect(`json_build_object('id', p.id, 'number', p.number, 'revision', p.revision)`, 'procedure')
    .addSelect(`to_char(c.tested_on, 'YYYY-MM-DD')`, 'testedOn')
    .addSelect('c.coupon', 'coupon')
    .addSelect('c.pipe', 'pipe')
    .addSelect('c.p_numbers', 'pNumbers')
    .addSelect('c.examiner', 'examiner')
    .addSelect('c.lab_report_number', 'labReportNumber')
    .addSelect('c.visual', 'visual')
    .addSelect('c.examination', 'examination')
    .addSelect('c.result', 'result')
    .addSelect('c.reasons', 'reasons')
    .addSelect('c.criteria_id', 'criteriaId')
    .addSelect('c.additional_criteria_id', 'additionalCriteriaId')
    .addSelect('c.evaluation', 'evaluation')
    .addSelect('c.rules_version', 'rulesVersion')
    // a combination coupon certifies one qualification per process: the first certified stands for them
    .addSelect(
      `(SELECT q.id FROM qualifications q WHERE q.coupon_id = c.id ORDER BY q.process = c.process DESC, q.created_at, q.id LIMIT 1)`,
      'qualificationId',
    )
    .addSelect('c.retest_of_id', 'retestOfId')
    .addSelect('c.notes', 'notes')
    .addSelect('c.version', 'version')
    .addSelect('c.created_at', 'createdAt')
    .addSelect(
      `CASE WHEN r.id IS NULL THEN NULL ELSE json_build_object('id', r.id, 'name', r.name) END`,
      'recordedBy',
    )
    .where('c.organization_id = :org', { org: actor.organizationId });
  return scopeWelders(qb, 'w', actor);
}

export async function listCoupons(db: EntityManager, actor: Actor, q: ListQuery): Promise<CouponRaw[]> {
  const qb = couponsQuery(db, actor);
  if (q.welderId) qb.andWhere('c.welder_id = :welderId', { welderId: q.welderId });
  if (q.result) qb.andWhere('c.result = :result', { result: q.result });
  return qb
    .orderBy('c.tested_on', 'DESC')
    .addOrderBy('c.created_at', 'DESC')
    .addOrderBy('c.id', 'ASC')
    .getRawMany<CouponRaw>();
}

export async function findCoupon(db: EntityManager, actor: Actor, id: string): Promise<CouponRaw | null> {
  return (await couponsQuery(db, actor).andWhere('c.id = :id', { id }).getRawOne<CouponRaw>()) ?? null;
}

export interface LockedCoupon {
  id: string;
  welderId: string;
  testedOn: string;
  code: string;
  process: string;
  coupon: Record<string, unknown>;
  result: string;
  version: number;
  /** The criteria set the examination was judged by (null: radiography/ultrasonics report). */
  criteriaId: string | null;
  qualificationId: string | null;
  retestOfId: string | null;
  retestBasis: string | null;
  /** Every process the coupon was welded with (a combination coupon's layers too). */
  processes: string[];
  /** A combination coupon's processes with the weld metal each deposited (QW-306), or null. */
  layers: Array<Record<string, unknown>> | null;
  snapshot: Record<string, unknown>;
}

/** The coupon row, locked for the rest of the transaction, with what an edit or a certification needs. */
export async function lockCoupon(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<LockedCoupon | null> {
  const rows: LockedCoupon[] = await db.query(
    `SELECT c.id, c.welder_id AS "welderId", to_char(c.tested_on, 'YYYY-MM-DD') AS "testedOn", c.code, c.process,
            c.coupon, c.result, c.version, c.criteria_id AS "criteriaId",
            (SELECT q.id FROM qualifications q WHERE q.coupon_id = c.id ORDER BY q.process = c.process DESC, q.created_at, q.id LIMIT 1) AS "qualificationId",
            c.retest_of_id AS "retestOfId", c.examination->'retest'->>'basis' AS "retestBasis", c.processes,
            c.examination->'layers' AS layers,
            json_build_object('shopId', c.shop_id, 'procedureId', c.procedure_id,
              'testedOn', to_char(c.tested_on, 'YYYY-MM-DD'), 'coupon', c.coupon, 'pipe', c.pipe,
              'pNumbers', c.p_numbers, 'examiner', c.examiner, 'labReportNumber', c.lab_report_number,
              'visual', c.visual, 'examination', c.examination, 'result', c.result, 'reasons', c.reasons,
              'criteriaId', c.criteria_id, 'additionalCriteriaId', c.additional_criteria_id,
              'rulesVersion', c.rules_version, 'notes', c.notes) AS snapshot
       FROM coupons c WHERE c.organization_id = $1 AND c.id = $2 FOR UPDATE OF c`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

export type CouponWrite = Pick<
  CouponRow,
  | 'shopId'
  | 'procedureId'
  | 'testedOn'
  | 'code'
  | 'process'
  | 'coupon'
  | 'pipe'
  | 'pNumbers'
  | 'examiner'
  | 'labReportNumber'
  | 'visual'
  | 'examination'
  | 'result'
  | 'reasons'
  | 'criteriaId'
  | 'additionalCriteriaId'
  | 'evaluation'
  | 'rulesVersion'
  | 'retestOfId'
  | 'notes'
>;

export async function insertCoupon(
  db: EntityManager,
  row: CouponWrite & { organizationId: string; welderId: string; recordedBy: string; at: Date },
): Promise<string> {
  const { at, ...fields } = row;
  const result = await db.insert(CouponEntity, { ...fields, version: 1, createdAt: at, updatedAt: at });
  return (result.identifiers[0] as { id: string }).id;
}

export async function updateCoupon(
  db: EntityManager,
  id: string,
  version: number,
  row: CouponWrite,
  at: Date,
): Promise<boolean> {
  const result = await db
    .createQueryBuilder()
    .update(CouponEntity)
    .set({ ...row, version: () => 'version + 1', updatedAt: at })
    .where('id = :id AND version = :version', { id, version })
    .execute();
  return result.affected === 1;
}

export async function replaceCouponUploads(db: EntityManager, couponId: string, uploadIds: string[]) {
  await db.query(`DELETE FROM coupon_uploads WHERE coupon_id = $1`, [couponId]);
  const unique = [...new Set(uploadIds)];
  if (unique.length > 0)
    await db.insert(
      CouponUploadEntity,
      unique.map((uploadId) => ({ couponId, uploadId })),
    );
}

export async function welderOfOrganization(db: EntityManager, organizationId: string, id: string) {
  const rows: { id: string }[] = await db.query(
    `SELECT id FROM welders WHERE organization_id = $1 AND id = $2`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

/** Passing test dates of each welder and process: the continuity evidence of their qualifications. */
export const passingTestDatesSql = (welder: string, process: string) =>
  `ARRAY(SELECT to_char(e.tested_on, 'YYYY-MM-DD') FROM coupons e
          WHERE e.welder_id = ${welder} AND ${process} = ANY (e.processes) AND e.result = 'accept' ORDER BY e.tested_on)`;

/** A rejected coupon of the welder, for a retest to name, with what the retest must match. */
export async function failedCouponOf(db: EntityManager, organizationId: string, welderId: string, id: string) {
  const rows: {
    id: string;
    testedOn: string;
    code: string;
    process: string;
    position: string;
    evaluation: { parts?: Array<{ kind: string; result: string }> } | null;
    visual: string;
  }[] = await db.query(
    `SELECT id, to_char(tested_on, 'YYYY-MM-DD') AS "testedOn", code, process, coupon->>'position' AS position,
            evaluation, visual
       FROM coupons
      WHERE organization_id = $1 AND welder_id = $2 AND id = $3 AND result = 'reject'`,
    [organizationId, welderId, id],
  );
  return rows[0] ?? null;
}

export interface RetestRow {
  id: string;
  retestOfId: string;
  code: string;
  basis: 'immediate' | 'after-training';
  result: 'accept' | 'reject' | 'replace-specimen';
  testedOn: string;
  qualificationId: string | null;
}

/** Every coupon recorded as a retest of these failed coupons, in the order they were tested. */
export async function retestsOf(db: EntityManager, failedIds: string[]): Promise<RetestRow[]> {
  if (failedIds.length === 0) return [];
  return db.query<RetestRow[]>(
    `SELECT c.id, c.retest_of_id AS "retestOfId", c.code, c.examination->'retest'->>'basis' AS basis, c.result,
            to_char(c.tested_on, 'YYYY-MM-DD') AS "testedOn",
            (SELECT q.id FROM qualifications q WHERE q.coupon_id = c.id ORDER BY q.process = c.process DESC, q.created_at, q.id LIMIT 1) AS "qualificationId"
       FROM coupons c
      WHERE c.retest_of_id = ANY($1::uuid[])
      ORDER BY c.tested_on, c.created_at, c.id`,
    [failedIds],
  );
}
