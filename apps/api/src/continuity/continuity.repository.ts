// The continuity log in PostgreSQL: the grid of one shop and month (one query), the upsert of a month's
// cells (one statement), removals, the review queue and one welder's logged use for the timeline.
import type { EntityManager } from 'typeorm';
import type { ReviewDecision } from '@beadroll/rules';

export interface GridCell {
  entryId: string;
  loggedBy: string | null;
  updatedAt: string;
  usedOn: string;
  jobReference: string;
  note: string;
  flaggedLapsed: boolean;
  version: number;
}
export interface GridRowRaw {
  welder: { id: string; stamp: string; name: string; homeShopId: string };
  home: boolean;
  qualifiedProcesses: string[];
  pairs: { process: string; code: string; lapsesOn: string; revokedOn: string | null }[];
  entries: (GridCell & { process: string })[];
}

/** Active welders of the shop (by stamp), then welders of other shops with an entry here this month. */
export async function gridRows(
  db: EntityManager,
  organizationId: string,
  shopId: string,
  month: string,
): Promise<GridRowRaw[]> {
  return db.query(
    `WITH month_entries AS (
       SELECT * FROM continuity_entries WHERE organization_id = $1 AND shop_id = $2 AND month = $3::date
     ),
     -- Two index reads joined by UNION rather than one OR: the planner then estimates the rows well (an OR
     -- over a CTE made it expect a million rows and spend longer compiling the query than running it).
     people AS (
       SELECT w.id, w.stamp, w.name, w.home_shop_id, w.home_shop_id = $2 AS home
         FROM welders w
        WHERE w.organization_id = $1 AND w.home_shop_id = $2 AND w.active
       UNION
       SELECT w.id, w.stamp, w.name, w.home_shop_id, w.home_shop_id = $2 AS home
         FROM welders w
        WHERE w.organization_id = $1 AND w.id IN (SELECT welder_id FROM month_entries)
     ),
     -- Set-based (one hash aggregate each), not a subquery per row: a big shop's grid has thousands of rows.
     -- Each (process, code) pair in force, with its lapse date and its revocation when every qualification
     -- of it is revoked (the walk's rule); a pair revoked before the month begins offers no cell.
     pair AS (
       SELECT q.welder_id, q.process, q.code, cs.lapses_on,
              CASE WHEN bool_and(q.revoked_on IS NOT NULL) THEN max(q.revoked_on) END AS revoked_on
         FROM qualifications q
         JOIN continuity_states cs ON (cs.welder_id, cs.process, cs.code) = (q.welder_id, q.process, q.code)
        WHERE q.organization_id = $1 AND q.welder_id IN (SELECT id FROM people) AND q.superseded_by_id IS NULL
        GROUP BY q.welder_id, q.process, q.code, cs.lapses_on
     ),
     held AS (
       SELECT welder_id,
              coalesce(array_agg(DISTINCT process ORDER BY process) FILTER (WHERE revoked_on IS NULL OR revoked_on > $3::date), '{}') AS processes,
              json_agg(json_build_object('process', process, 'code', code, 'lapsesOn', to_char(lapses_on, 'YYYY-MM-DD'),
                       'revokedOn', to_char(revoked_on, 'YYYY-MM-DD')) ORDER BY process, code) AS pairs
         FROM pair GROUP BY welder_id
     ),
     logged AS (
       SELECT e.welder_id, json_agg(json_build_object('process', e.process, 'entryId', e.id,
                'usedOn', to_char(e.used_on, 'YYYY-MM-DD'), 'jobReference', e.job_reference,
                'note', e.note, 'flaggedLapsed', e.flagged_lapsed, 'version', e.version,
                'loggedBy', u.name, 'updatedAt', e.updated_at) ORDER BY e.process) AS entries
         FROM month_entries e LEFT JOIN users u ON u.id = e.logged_by GROUP BY e.welder_id
     )
     SELECT json_build_object('id', p.id, 'stamp', p.stamp, 'name', p.name, 'homeShopId', p.home_shop_id) AS welder,
            p.home, coalesce(h.processes, '{}') AS "qualifiedProcesses", coalesce(h.pairs, '[]') AS pairs,
            coalesce(l.entries, '[]') AS entries
       FROM people p LEFT JOIN held h ON h.welder_id = p.id LEFT JOIN logged l ON l.welder_id = p.id
      ORDER BY p.home DESC, p.stamp, p.id`,
    [organizationId, shopId, month],
  );
}

/** Welders of the company who can be added to a shop's grid, by stamp or name. */
export async function addableWelders(db: EntityManager, organizationId: string, shopId: string, q: string | undefined) {
  const pattern = q ? `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : '%';
  return db.query<{ id: string; stamp: string; name: string; homeShop: { id: string; name: string; code: string }; qualifiedProcesses: string[] }[]>(
    `SELECT w.id, w.stamp, w.name, json_build_object('id', s.id, 'name', s.name, 'code', s.code) AS "homeShop",
            ARRAY(SELECT DISTINCT q.process FROM qualifications q
                   WHERE q.welder_id = w.id AND q.superseded_by_id IS NULL AND q.revoked_on IS NULL
                   ORDER BY q.process) AS "qualifiedProcesses"
       FROM welders w JOIN shops s ON s.id = w.home_shop_id
      WHERE w.organization_id = $1 AND w.active AND w.home_shop_id <> $2
        AND (w.stamp ILIKE $3 OR w.name ILIKE $3)
      ORDER BY w.stamp LIMIT 25`,
    [organizationId, shopId, pattern],
  );
}

/** For each requested welder: whether it is of the company, and the processes it holds a qualification for. */
export async function weldersWithProcesses(db: EntityManager, organizationId: string, welderIds: string[]) {
  const rows = await db.query<{ id: string; processes: string[] }[]>(
    `SELECT w.id, ARRAY(SELECT DISTINCT q.process FROM qualifications q
                         WHERE q.welder_id = w.id AND q.superseded_by_id IS NULL) AS processes
       FROM welders w WHERE w.organization_id = $1 AND w.id = ANY($2::uuid[])`,
    [organizationId, welderIds],
  );
  return new Map(rows.map((r) => [r.id, new Set(r.processes)]));
}

export interface EntrySnapshot {
  id: string;
  welderId: string;
  process: string;
  usedOn: string;
  jobReference: string;
  note: string;
  version: number;
}

const snapshotColumns = `id, welder_id AS "welderId", process, to_char(used_on, 'YYYY-MM-DD') AS "usedOn",
  job_reference AS "jobReference", note, version`;

/** Who last wrote each of the given entries, for the message of a stale save. */
export async function lastWriters(db: EntityManager, ids: string[]) {
  const rows = await db.query<{ id: string; name: string | null; updatedAt: string }[]>(
    `SELECT e.id, u.name, to_char(e.updated_at AT TIME ZONE 'UTC', 'YYYY-MM-DD HH24:MI') || ' UTC' AS "updatedAt"
       FROM continuity_entries e LEFT JOIN users u ON u.id = e.logged_by WHERE e.id = ANY($1::uuid[])`,
    [ids],
  );
  return new Map(rows.map((r) => [r.id, r]));
}

/** The month's entries of the shop, locked for the save. */
export async function lockMonthEntries(db: EntityManager, organizationId: string, shopId: string, month: string) {
  return db.query<EntrySnapshot[]>(
    `SELECT ${snapshotColumns} FROM continuity_entries
      WHERE organization_id = $1 AND shop_id = $2 AND month = $3::date FOR UPDATE`,
    [organizationId, shopId, month],
  );
}

/**
 * Inserts or updates every cell in one statement; a cell already saved with the same values is left
 * alone. Returns the rows written, with whether each was new — two saves of one cell end in one row.
 */
export async function upsertCells(
  db: EntityManager,
  e: { organizationId: string; shopId: string; month: string; loggedBy: string; at: Date },
  cells: { welderId: string; process: string; usedOn: string; jobReference: string; note: string }[],
): Promise<(EntrySnapshot & { inserted: boolean })[]> {
  if (cells.length === 0) return [];
  return db.query(
    `INSERT INTO continuity_entries AS e
            (organization_id, welder_id, shop_id, process, month, used_on, job_reference, note, logged_by,
             created_at, updated_at)
     SELECT $1, c.welder_id, $2, c.process, $3::date, c.used_on, c.job_reference, c.note, $4, $5, $5
       FROM unnest($6::uuid[], $7::text[], $8::date[], $9::text[], $10::text[])
            AS c(welder_id, process, used_on, job_reference, note)
     ON CONFLICT (welder_id, process, shop_id, month) DO UPDATE SET
            used_on = EXCLUDED.used_on, job_reference = EXCLUDED.job_reference, note = EXCLUDED.note,
            logged_by = EXCLUDED.logged_by, updated_at = EXCLUDED.updated_at, version = e.version + 1,
            -- A reviewed entry that is edited is a new statement of fact: it waits for review again (the
            -- refresh that follows clears the status if the edit leaves it unflagged).
            review_status = CASE WHEN e.review_status = 'reviewed' THEN 'pending' ELSE e.review_status END,
            review_decision = NULL
      WHERE (e.used_on, e.job_reference, e.note) IS DISTINCT FROM (EXCLUDED.used_on, EXCLUDED.job_reference, EXCLUDED.note)
     RETURNING ${snapshotColumns}, (xmax = 0) AS inserted`,
    [
      e.organizationId,
      e.shopId,
      e.month,
      e.loggedBy,
      e.at,
      cells.map((c) => c.welderId),
      cells.map((c) => c.process),
      cells.map((c) => c.usedOn),
      cells.map((c) => c.jobReference),
      cells.map((c) => c.note),
    ],
  );
}

export async function removeCells(
  db: EntityManager,
  e: { organizationId: string; shopId: string; month: string },
  cells: { welderId: string; process: string }[],
): Promise<EntrySnapshot[]> {
  if (cells.length === 0) return [];
  // For DELETE … RETURNING TypeORM's postgres driver hands back [rows, affected count].
  const [rows] = await db.query<[EntrySnapshot[], number]>(
    `DELETE FROM continuity_entries
      WHERE organization_id = $1 AND shop_id = $2 AND month = $3::date
        AND (welder_id, process) IN (SELECT * FROM unnest($4::uuid[], $5::text[]))
      RETURNING ${snapshotColumns}`,
    [e.organizationId, e.shopId, e.month, cells.map((c) => c.welderId), cells.map((c) => c.process)],
  );
  return rows;
}

const reviewColumns = `e.id, json_build_object('id', w.id, 'stamp', w.stamp, 'name', w.name) AS welder,
  json_build_object('id', s.id, 'name', s.name, 'code', s.code) AS shop, e.process,
  to_char(e.used_on, 'YYYY-MM-DD') AS "usedOn", e.job_reference AS "jobReference", e.note,
  e.review_status AS "reviewStatus", e.review_note AS "reviewNote", e.review_decision AS "reviewDecision",
  u.name AS "loggedBy"`;

export interface ReviewEntryRow {
  id: string;
  welder: { id: string; stamp: string; name: string };
  shop: { id: string; name: string; code: string };
  process: string;
  usedOn: string;
  jobReference: string;
  note: string;
  reviewStatus: 'pending' | 'reviewed' | null;
  reviewNote: string | null;
  reviewDecision: ReviewDecision | null;
  loggedBy: string | null;
}

export async function pendingReview(db: EntityManager, organizationId: string): Promise<ReviewEntryRow[]> {
  return db.query<ReviewEntryRow[]>(
    `SELECT ${reviewColumns}
       FROM continuity_entries e JOIN welders w ON w.id = e.welder_id JOIN shops s ON s.id = e.shop_id
       LEFT JOIN users u ON u.id = e.logged_by
      WHERE e.organization_id = $1 AND e.flagged_lapsed AND e.review_status = 'pending'
      ORDER BY e.used_on, w.stamp, e.process`,
    [organizationId],
  );
}

export async function markReviewed(
  db: EntityManager,
  organizationId: string,
  id: string,
  r: { decision: ReviewDecision; note: string; by: string; at: Date },
): Promise<{ id: string; reviewStatus: string | null; flaggedLapsed: boolean } | null> {
  const [row] = await db.query<{ id: string; reviewStatus: string | null; flaggedLapsed: boolean }[]>(
    `SELECT id, review_status AS "reviewStatus", flagged_lapsed AS "flaggedLapsed" FROM continuity_entries
      WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  if (!row || !row.flaggedLapsed || row.reviewStatus !== 'pending') return row ?? null;
  await db.query(
    `UPDATE continuity_entries SET review_status = 'reviewed', review_decision = $5, review_note = $2, reviewed_by = $3,
            reviewed_at = $4, version = version + 1, updated_at = $4 WHERE id = $1`,
    [id, r.note, r.by, r.at, r.decision],
  );
  return { ...row, reviewStatus: 'reviewed' };
}

/** One welder's logged use with shop and job, and its qualifications (for revocation events). */
export async function welderHistory(db: EntityManager, welderId: string) {
  const entries = await db.query<
    { id: string; process: string; shop: string; jobReference: string; note: string; flaggedLapsed: boolean; reviewStatus: string | null }[]
  >(
    `SELECT e.id, e.process, s.name AS shop, e.job_reference AS "jobReference", e.note,
            e.flagged_lapsed AS "flaggedLapsed", e.review_status AS "reviewStatus"
       FROM continuity_entries e JOIN shops s ON s.id = e.shop_id WHERE e.welder_id = $1`,
    [welderId],
  );
  const qualifications = await db.query<
    { id: string; process: string; code: string; revokedOn: string | null; revokedReason: string | null; superseded: boolean }[]
  >(
    `SELECT id, process, code, to_char(revoked_on, 'YYYY-MM-DD') AS "revokedOn", revoked_reason AS "revokedReason",
            superseded_by_id IS NOT NULL AS superseded
       FROM qualifications WHERE welder_id = $1`,
    [welderId],
  );
  // Production welds are use of their process too (the walk carries each weld pass's id).
  const welds = await db.query<{ id: string; shop: string; jobReference: string; weldNumber: string; qualified: boolean }[]>(
    `SELECT p.id, s.name AS shop, w.job_reference AS "jobReference", w.weld_number AS "weldNumber", p.qualified
       FROM weld_passes p JOIN welds w ON w.id = p.weld_id JOIN shops s ON s.id = w.shop_id WHERE p.welder_id = $1`,
    [welderId],
  );
  return { entries, qualifications, welds };
}

/**
 * Audit events of many continuity entries in ONE statement (a month save or the demo seed writes dozens);
 * the same rows lib/audit's recordAudit writes one by one.
 */
export async function insertEntryAudits(
  db: EntityManager,
  actor: { organizationId: string; id: string },
  at: Date,
  events: { action: string; entityId: string; before: Record<string, unknown> | null; after: Record<string, unknown> | null }[],
): Promise<void> {
  if (events.length === 0) return;
  await db.query(
    `INSERT INTO audit_events (organization_id, actor_id, at, action, entity_type, entity_id, before, after)
     SELECT $1, $2, $3, x.action, 'continuity-entry', x.entity_id, x.before, x.after
       FROM jsonb_to_recordset($4::jsonb) AS x(action text, entity_id uuid, before jsonb, after jsonb)`,
    [
      actor.organizationId,
      actor.id,
      at,
      JSON.stringify(events.map((e) => ({ action: e.action, entity_id: e.entityId, before: e.before, after: e.after }))),
    ],
  );
}
