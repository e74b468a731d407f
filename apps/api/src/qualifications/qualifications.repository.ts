// Qualifications in PostgreSQL, scoped through their welder; each row carries its pair's maintained
// continuity state (continuity_states, joined by its key), so a list stays one query.
import type { EntityManager } from 'typeorm';
import { scopeWelders, type Actor } from '../lib/scope.js';
import { companyWarnDaysSql } from '../continuity/continuity-state.repository.js';
import { QualificationEntity, type QualificationRow } from './qualification.entity.js';
import { preparedQuery } from '../lib/prepared.js';

export interface QualificationRaw {
  id: string;
  welder: { id: string; name: string; stamp: string };
  couponId: string;
  number: string;
  code: string;
  process: string;
  transferMode: string | null;
  progression: string | null;
  ranges: Record<string, unknown>;
  certifiedOn: string;
  certifiedBy: { id: string; name: string };
  rulesVersion: string;
  revokedOn: string | null;
  revokedReason: string | null;
  supersededById: string | null;
  version: number;
  /** The certified coupon's test date: the qualification date for continuity. */
  qualifiedOn: string;
  /** The pair's maintained continuity state (continuity_states): lapsesOn and the last counted evidence. */
  stateLapsesOn: string | null;
  stateLastEvidence: string | null;
  /** The company's largest lead time (company settings; 30 when none are set). */
  warnDays: number;
}

function qualificationsQuery(db: EntityManager, actor: Actor) {
  const qb = db
    .createQueryBuilder()
    .from(QualificationEntity, 'q')
    .innerJoin('Welder', 'w', 'w.id = q.welder_id')
    .innerJoin('Coupon', 'c', 'c.id = q.coupon_id')
    .select('q.id', 'id')
    .addSelect(`json_build_object('id', w.id, 'name', w.name, 'stamp', w.stamp)`, 'welder')
    .addSelect('q.coupon_id', 'couponId')
    .addSelect('q.number', 'number')
    .addSelect('q.code', 'code')
    .addSelect('q.process', 'process')
    .addSelect('q.transfer_mode', 'transferMode')
    .addSelect('q.progression', 'progression')
    .addSelect('q.ranges', 'ranges')
    .addSelect(`to_char(q.certified_on, 'YYYY-MM-DD')`, 'certifiedOn')
    .addSelect(`json_build_object('id', q.certified_by, 'name', q.certified_by_name)`, 'certifiedBy')
    .addSelect('q.rules_version', 'rulesVersion')
    .addSelect(`to_char(q.revoked_on, 'YYYY-MM-DD')`, 'revokedOn')
    .addSelect('q.revoked_reason', 'revokedReason')
    .addSelect('q.superseded_by_id', 'supersededById')
    .addSelect('q.version', 'version')
    .addSelect(`to_char(c.tested_on, 'YYYY-MM-DD')`, 'qualifiedOn')
    .leftJoin('continuity_states', 'cs', 'cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code')
    .addSelect(`to_char(cs.lapses_on, 'YYYY-MM-DD')`, 'stateLapsesOn')
    .addSelect(`to_char(cs.last_evidence, 'YYYY-MM-DD')`, 'stateLastEvidence')
    .addSelect(companyWarnDaysSql('q.organization_id'), 'warnDays')
    .where('q.organization_id = :org', { org: actor.organizationId });
  return scopeWelders(qb, 'w', actor);
}

export async function listQualifications(
  db: EntityManager,
  actor: Actor,
  f: { welderId?: string; superseded?: boolean },
): Promise<QualificationRaw[]> {
  const qb = qualificationsQuery(db, actor);
  if (f.welderId) qb.andWhere('q.welder_id = :welderId', { welderId: f.welderId });
  if (f.superseded !== undefined)
    qb.andWhere(f.superseded ? 'q.superseded_by_id IS NOT NULL' : 'q.superseded_by_id IS NULL');
  // A hot read (the welder file, the verify page): run as a prepared statement (lib/prepared.ts).
  const [sql, params] = qb
    .orderBy('w.stamp', 'ASC')
    .addOrderBy('q.certified_on', 'DESC')
    .addOrderBy('q.id', 'ASC')
    .getQueryAndParameters();
  return preparedQuery<QualificationRaw>(db, sql, params);
}

export async function findQualification(db: EntityManager, actor: Actor, id: string) {
  return (
    (await qualificationsQuery(db, actor).andWhere('q.id = :id', { id }).getRawOne<QualificationRaw>()) ??
    null
  );
}

export async function lockQualification(db: EntityManager, organizationId: string, id: string) {
  const rows: {
    id: string;
    welderId: string;
    code: string;
    process: string;
    certifiedOn: string;
    revokedOn: string | null;
    supersededById: string | null;
    version: number;
  }[] = await db.query(
    `SELECT id, welder_id AS "welderId", code, process, to_char(certified_on, 'YYYY-MM-DD') AS "certifiedOn",
            to_char(revoked_on, 'YYYY-MM-DD') AS "revokedOn", superseded_by_id AS "supersededById", version
       FROM qualifications WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

export async function insertQualification(
  db: EntityManager,
  row: Omit<
    QualificationRow,
    | 'id'
    | 'number'
    | 'version'
    | 'createdAt'
    | 'updatedAt'
    | 'revokedOn'
    | 'revokedReason'
    | 'revokedBy'
    | 'supersededById'
  > & {
    at: Date;
  },
): Promise<string> {
  const { at, ...fields } = row;
  const result = await db.insert(QualificationEntity, {
    ...fields,
    revokedOn: null,
    revokedReason: null,
    revokedBy: null,
    supersededById: null,
    version: 1,
    createdAt: at,
    updatedAt: at,
  });
  return (result.identifiers[0] as { id: string }).id;
}

export async function markSuperseded(db: EntityManager, id: string, by: string, at: Date): Promise<void> {
  await db.query(
    `UPDATE qualifications SET superseded_by_id = $2, version = version + 1, updated_at = $3 WHERE id = $1`,
    [id, by, at],
  );
}

export async function markRevoked(
  db: EntityManager,
  id: string,
  r: { revokedOn: string; reason: string; by: string; at: Date },
): Promise<void> {
  await db.query(
    `UPDATE qualifications SET revoked_on = $2, revoked_reason = $3, revoked_by = $4, version = version + 1,
            updated_at = $5 WHERE id = $1`,
    [id, r.revokedOn, r.reason, r.by, r.at],
  );
}

export async function userName(db: EntityManager, id: string): Promise<string> {
  const rows: { name: string }[] = await db.query(`SELECT name FROM users WHERE id = $1`, [id]);
  return rows[0]?.name ?? '';
}

export async function organizationName(db: EntityManager, id: string): Promise<string> {
  const rows: { name: string }[] = await db.query(`SELECT name FROM organizations WHERE id = $1`, [id]);
  return rows[0]?.name ?? '';
}
