// SQL of the production weld log: welds with their passes (one welder and process each) and the check of
// each pass, listed set-based with the passes aggregated in the same statement.
import type { EntityManager } from 'typeorm';
import type { Weld, WeldListQuery, WeldReason, WeldWelder } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import type { WeldRow } from './weld.entity.js';

export const PAGE_SIZE = 100;

/** A weld to insert: the row's own fields, who logged it and when. */
export type NewWeld = Pick<
  WeldRow,
  'organizationId' | 'shopId' | 'jobReference' | 'weldNumber' | 'weldedOn' | 'procedureId' | 'joint' | 'examination' | 'note' | 'flagged' | 'rulesVersion'
> & { loggedBy: string; at: Date };

export interface PassCheck {
  welderId: string;
  process: string;
  layer: string;
  qualified: boolean;
  qualificationId: string | null;
  reasons: WeldReason[];
  tested: boolean;
}

export async function insertWeld(db: EntityManager, w: NewWeld): Promise<string> {
  const [row] = await db.query<{ id: string }[]>(
    `INSERT INTO welds (organization_id, shop_id, job_reference, weld_number, welded_on, procedure_id, joint,
                        examination, note, flagged, checked_at, rules_version, review_status, logged_by,
                        created_at, updated_at)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, CASE WHEN $10 THEN 'pending' END, $13, $11, $11)
     RETURNING id`,
    [
      w.organizationId,
      w.shopId,
      w.jobReference,
      w.weldNumber,
      w.weldedOn,
      w.procedureId,
      JSON.stringify(w.joint),
      w.examination === null ? null : JSON.stringify(w.examination),
      w.note,
      w.flagged,
      w.at,
      w.rulesVersion,
      w.loggedBy,
    ],
  );
  return row!.id;
}

export async function insertPasses(
  db: EntityManager,
  weld: { id: string; organizationId: string; weldedOn: string },
  passes: PassCheck[],
): Promise<void> {
  await db.query(
    `INSERT INTO weld_passes (weld_id, organization_id, welder_id, process, layer, welded_on, qualified,
                              qualification_id, reasons, tested, position)
     SELECT $1, $2, x.welder_id, x.process, x.layer, $3, x.qualified, x.qualification_id, x.reasons, x.tested, x.position
       FROM jsonb_to_recordset($4::jsonb) AS x(welder_id uuid, process text, layer text, qualified boolean,
                                               qualification_id uuid, reasons jsonb, tested boolean, position int)`,
    [
      weld.id,
      weld.organizationId,
      weld.weldedOn,
      JSON.stringify(
        passes.map((p, i) => ({
          welder_id: p.welderId,
          process: p.process,
          layer: p.layer,
          qualified: p.qualified,
          qualification_id: p.qualificationId,
          reasons: p.reasons,
          tested: p.tested,
          position: i,
        })),
      ),
    ],
  );
}

/** The welders of the company among `ids` (any shop: a welder may weld in every shop of the company). */
export async function companyWelders(db: EntityManager, organizationId: string, ids: string[]) {
  const rows = await db.query<{ id: string; stamp: string; active: boolean }[]>(
    `SELECT id, stamp, active FROM welders WHERE organization_id = $1 AND id = ANY($2::uuid[])`,
    [organizationId, ids],
  );
  return new Map(rows.map((r) => [r.id, r]));
}

// Whether a pass counted as documented use: some pair of its welder and process has it inside its life
// and did not ignore its day (DEVELOPERS.md "What counts as evidence").
const countedSql = `EXISTS (SELECT 1 FROM continuity_states cs
                             WHERE cs.welder_id = p.welder_id AND cs.process = p.process
                               AND p.welded_on >= cs.qualified_on AND NOT (p.welded_on = ANY (cs.ignored)))`;

const weldColumns = `
  w.id, json_build_object('id', s.id, 'name', s.name, 'code', s.code) AS shop,
  w.job_reference AS "jobReference", w.weld_number AS "weldNumber", to_char(w.welded_on, 'YYYY-MM-DD') AS "weldedOn",
  CASE WHEN pr.id IS NULL THEN NULL ELSE json_build_object('id', pr.id, 'number', pr.number, 'revision', pr.revision) END AS procedure,
  w.joint, w.examination, w.note, w.flagged, w.checked_at AS "checkedAt", w.rules_version AS "rulesVersion",
  w.review_status AS "reviewStatus",
  CASE WHEN w.disposition IS NULL THEN NULL ELSE json_build_object('decision', w.disposition, 'reason', w.disposition_reason,
       'by', du.name, 'at', w.disposition_at) END AS disposition,
  lu.name AS "loggedBy", w.created_at AS "createdAt", w.version,
  coalesce((SELECT json_agg(json_build_object(
              'id', p.id, 'welder', json_build_object('id', wd.id, 'stamp', wd.stamp, 'name', wd.name),
              'process', p.process, 'layer', p.layer, 'qualified', p.qualified, 'qualificationId', p.qualification_id,
              'qualificationNumber', q.number, 'reasons', p.reasons, 'countedForContinuity', ${countedSql})
              ORDER BY p.position)
              FROM weld_passes p JOIN welders wd ON wd.id = p.welder_id
              LEFT JOIN qualifications q ON q.id = p.qualification_id
             WHERE p.weld_id = w.id), '[]') AS passes`;

const weldFrom = `
  FROM welds w JOIN shops s ON s.id = w.shop_id
  LEFT JOIN procedures pr ON pr.id = w.procedure_id
  LEFT JOIN users du ON du.id = w.disposition_by
  LEFT JOIN users lu ON lu.id = w.logged_by`;

type WeldDbRow = Omit<Weld, 'checkedAt' | 'createdAt' | 'disposition'> & {
  checkedAt: Date;
  createdAt: Date;
  disposition: { decision: string; reason: string; by: string | null; at: string } | null;
};

const toWeld = (r: WeldDbRow): Weld =>
  ({
    ...r,
    checkedAt: new Date(r.checkedAt).toISOString(),
    createdAt: new Date(r.createdAt).toISOString(),
    disposition: r.disposition ? { ...r.disposition, at: new Date(r.disposition.at).toISOString() } : null,
  }) as Weld;

/** The shops the actor may read welds of: a foreman only their own; a QA manager every shop of the company. */
function shopScope(actor: Actor, params: unknown[]): string {
  params.push(actor.organizationId);
  let sql = `w.organization_id = $${params.length}`;
  if (actor.role !== 'qa_manager') {
    params.push(actor.shopIds);
    sql += ` AND w.shop_id = ANY($${params.length}::uuid[])`;
  }
  return sql;
}

export async function listWelds(db: EntityManager, actor: Actor, q: WeldListQuery) {
  const params: unknown[] = [];
  const where = [shopScope(actor, params)];
  const add = (sql: (n: number) => string, v: unknown) => {
    params.push(v);
    where.push(sql(params.length));
  };
  if (q.job) add((n) => `w.job_reference = $${n}`, q.job);
  if (q.shopId) add((n) => `w.shop_id = $${n}`, q.shopId);
  if (q.welderId) add((n) => `EXISTS (SELECT 1 FROM weld_passes p WHERE p.weld_id = w.id AND p.welder_id = $${n})`, q.welderId);
  if (q.from) add((n) => `w.welded_on >= $${n}`, q.from);
  if (q.to) add((n) => `w.welded_on <= $${n}`, q.to);
  if (q.flagged === 'true') where.push('w.flagged');
  if (q.flagged === 'false') where.push('NOT w.flagged');
  if (q.flagged === 'pending') where.push(`w.review_status = 'pending'`);
  const cond = where.join(' AND ');
  const [count] = await db.query<{ n: number }[]>(`SELECT count(*)::int AS n FROM welds w WHERE ${cond}`, params);
  const offset = (q.page - 1) * PAGE_SIZE;
  const rows = await db.query<WeldDbRow[]>(
    `SELECT ${weldColumns} ${weldFrom} WHERE ${cond}
      ORDER BY w.job_reference, length(w.weld_number), w.weld_number LIMIT ${PAGE_SIZE} OFFSET ${offset}`,
    params,
  );
  return { items: rows.map(toWeld), total: count?.n ?? 0, page: q.page, pageSize: PAGE_SIZE };
}

export async function findWeld(db: EntityManager, actor: Actor, id: string): Promise<Weld | null> {
  const params: unknown[] = [];
  const scope = shopScope(actor, params);
  params.push(id);
  const [row] = await db.query<WeldDbRow[]>(`SELECT ${weldColumns} ${weldFrom} WHERE ${scope} AND w.id = $${params.length}`, params);
  return row ? toWeld(row) : null;
}

/** Locks a weld of the company for a disposition; null when it is not the company's. */
export async function lockWeld(db: EntityManager, organizationId: string, id: string) {
  const [row] = await db.query<{ id: string; shopId: string; flagged: boolean; reviewStatus: string | null }[]>(
    `SELECT id, shop_id AS "shopId", flagged, review_status AS "reviewStatus" FROM welds
      WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  return row ?? null;
}

export async function setDisposition(
  db: EntityManager,
  id: string,
  d: { decision: string; reason: string; by: string; at: Date },
): Promise<void> {
  await db.query(
    `UPDATE welds SET review_status = 'dispositioned', disposition = $2, disposition_reason = $3, disposition_by = $4,
            disposition_at = $5, updated_at = $5, version = version + 1 WHERE id = $1`,
    [id, d.decision, d.reason, d.by, d.at],
  );
}

/**
 * The passes of the given welders and processes welded on or after `from` (a re-check after a change that
 * may move their answer), with their weld's joint and state.
 */
export async function passesToRecheck(
  db: EntityManager,
  organizationId: string,
  keys: { welderId: string; process: string; from: string }[],
) {
  if (keys.length === 0) return [];
  return db.query<
    {
      passId: string;
      weldId: string;
      welderId: string;
      process: string;
      weldedOn: string;
      joint: Record<string, unknown>;
      qualified: boolean;
      qualificationId: string | null;
      reasons: WeldReason[];
      flagged: boolean;
      reviewStatus: string | null;
    }[]
  >(
    `SELECT p.id AS "passId", w.id AS "weldId", p.welder_id AS "welderId", p.process,
            to_char(p.welded_on, 'YYYY-MM-DD') AS "weldedOn", w.joint, p.qualified,
            p.qualification_id AS "qualificationId", p.reasons, w.flagged, w.review_status AS "reviewStatus"
       FROM unnest($2::uuid[], $3::text[], $4::date[]) AS k(welder_id, process, from_date)
       JOIN weld_passes p ON p.welder_id = k.welder_id AND p.process = k.process AND p.welded_on >= k.from_date
       JOIN welds w ON w.id = p.weld_id
      WHERE w.organization_id = $1
      ORDER BY p.welded_on, w.id`,
    [organizationId, keys.map((k) => k.welderId), keys.map((k) => k.process), keys.map((k) => k.from)],
  );
}

export async function updatePassCheck(
  db: EntityManager,
  passId: string,
  c: { qualified: boolean; qualificationId: string | null; reasons: WeldReason[] },
): Promise<void> {
  await db.query(`UPDATE weld_passes SET qualified = $2, qualification_id = $3, reasons = $4 WHERE id = $1`, [
    passId,
    c.qualified,
    c.qualificationId,
    JSON.stringify(c.reasons),
  ]);
}

/**
 * Sets each weld's flag from its passes after a re-check: a weld newly flagged waits for a disposition; one
 * no longer flagged keeps a disposition already given, and otherwise leaves the queue. Returns the welds
 * newly flagged.
 */
export async function reflagWelds(
  db: EntityManager,
  weldIds: string[],
  c: { at: Date; rulesVersion: string },
): Promise<{ id: string; flagged: boolean }[]> {
  if (weldIds.length === 0) return [];
  // Wrapped in a SELECT: TypeORM answers a bare UPDATE … RETURNING with [rows, count].
  return db.query<{ id: string; flagged: boolean }[]>(
    `WITH changed AS (UPDATE welds w
        SET flagged = f.flag, checked_at = $2, rules_version = $3, updated_at = $2, version = w.version + 1,
            review_status = CASE WHEN f.flag AND NOT w.flagged THEN 'pending'
                                 WHEN NOT f.flag AND w.review_status = 'pending' THEN NULL
                                 ELSE w.review_status END,
            disposition = CASE WHEN f.flag AND NOT w.flagged THEN NULL ELSE w.disposition END
       FROM (SELECT p.weld_id, bool_or(NOT p.qualified) AS flag FROM weld_passes p
              WHERE p.weld_id = ANY($1::uuid[]) GROUP BY p.weld_id) f
      WHERE w.id = f.weld_id AND w.flagged IS DISTINCT FROM f.flag
      RETURNING w.id, w.flagged)
     SELECT id, flagged FROM changed ORDER BY id`,
    [weldIds, c.at, c.rulesVersion],
  );
}

/** Active welders of the company by stamp or name, with their qualifications in force and ranges (the form's live check). */
export async function weldWelders(db: EntityManager, organizationId: string, q: string | undefined): Promise<WeldWelder[]> {
  const pattern = q ? `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : '%';
  return db.query<WeldWelder[]>(
    `SELECT w.id, w.stamp, w.name, json_build_object('id', s.id, 'name', s.name, 'code', s.code) AS "homeShop",
            coalesce((SELECT json_agg(json_build_object('id', q.id, 'number', q.number, 'code', q.code, 'process', q.process,
                                      'ranges', q.ranges, 'revokedOn', to_char(q.revoked_on, 'YYYY-MM-DD'),
                                      'lapsesOn', to_char(cs.lapses_on, 'YYYY-MM-DD')) ORDER BY q.process, q.code)
                        FROM qualifications q
                        LEFT JOIN continuity_states cs ON (cs.welder_id, cs.process, cs.code) = (q.welder_id, q.process, q.code)
                       WHERE q.welder_id = w.id AND q.superseded_by_id IS NULL), '[]') AS qualifications
       FROM welders w JOIN shops s ON s.id = w.home_shop_id
      WHERE w.organization_id = $1 AND w.active AND (w.stamp ILIKE $2 OR w.name ILIKE $2)
      ORDER BY (upper(w.stamp) = upper($3)) DESC, w.stamp LIMIT 25`,
    [organizationId, pattern, q ?? ''],
  );
}
