// The SQL of lapse watch. The scan reads continuity_states through its (organization_id, lapses_on)
// index; notices and deliveries are written set-based with ON CONFLICT DO NOTHING, so a rerun, a backfill
// or a second instance never duplicates one; digests claim their deliveries with FOR UPDATE SKIP LOCKED.
import type { EntityManager } from 'typeorm';
import { DEFAULT_COMPANY_SETTINGS, type LapseWatchRun } from '@beadroll/rules';

export interface ScanWindow {
  organizationId: string;
  asOf: string;
  /** Lapses after this day and up to asOf are reported as 'lapsed'. */
  lapsedSince: string;
  /** Lead times in days. */
  warnDays: number[];
}

export interface Candidate {
  qualificationId: string;
  welderId: string;
  stamp: string;
  name: string;
  homeShopId: string;
  process: string;
  code: string;
  threshold: string;
  lapsesOn: string;
  daysLeft: number;
  lastUse: string | null;
}

// One row per qualification and threshold crossed at asOf: 'lapsed' for a lapse in (lapsedSince, asOf],
// else each lead time d with 0 < days left <= d.
const candidatesSql = `
  WITH c AS (
    SELECT q.id AS qualification_id, q.organization_id, q.process, q.code, w.id AS welder_id, w.stamp, w.name,
           w.home_shop_id, cs.lapses_on, cs.lapses_on - $2::date AS days_left, cs.last_evidence
      FROM continuity_states cs
      JOIN qualifications q ON q.welder_id = cs.welder_id AND q.process = cs.process AND q.code = cs.code
      JOIN welders w ON w.id = q.welder_id AND w.organization_id = cs.organization_id
     WHERE cs.organization_id = $1
       AND cs.lapses_on > $3::date
       AND cs.lapses_on <= $2::date + (SELECT max(d) FROM unnest($4::int[]) d)
       AND q.organization_id = $1
       AND q.superseded_by_id IS NULL
       AND (q.revoked_on IS NULL OR q.revoked_on > $2::date)
       AND w.active
  )
  SELECT c.*, t.threshold
    FROM c
   CROSS JOIN LATERAL (
     SELECT 'lapsed'::text AS threshold WHERE c.days_left <= 0
     UNION ALL
     SELECT d::text FROM unnest($4::int[]) d WHERE c.days_left > 0 AND c.days_left <= d
   ) t`;

const params = (w: ScanWindow) => [w.organizationId, w.asOf, w.lapsedSince, w.warnDays];

/** What a run at asOf would write: candidates that have no notice yet. */
export async function previewCandidates(db: EntityManager, w: ScanWindow): Promise<Candidate[]> {
  return db.query<Candidate[]>(
    `SELECT x.qualification_id AS "qualificationId", x.welder_id AS "welderId", x.stamp, x.name,
            x.home_shop_id AS "homeShopId", x.process, x.code, x.threshold,
            to_char(x.lapses_on, 'YYYY-MM-DD') AS "lapsesOn", x.days_left AS "daysLeft",
            to_char(x.last_evidence, 'YYYY-MM-DD') AS "lastUse"
       FROM (${candidatesSql}) x
      WHERE NOT EXISTS (SELECT 1 FROM lapse_notices n
                         WHERE n.qualification_id = x.qualification_id AND n.threshold = x.threshold
                           AND n.lapses_on = x.lapses_on)
      ORDER BY x.lapses_on, x.stamp, x.process, x.threshold`,
    params(w),
  );
}

/** Writes the new notices of this run and a pending delivery of each to each of its recipients. */
export async function writeNotices(
  db: EntityManager,
  w: ScanWindow,
  runId: string,
  now: Date,
): Promise<number> {
  const created = await db.query<{ id: string }[]>(
    `INSERT INTO lapse_notices (organization_id, qualification_id, threshold, lapses_on, run_id, created_at)
     SELECT x.organization_id, x.qualification_id, x.threshold, x.lapses_on, $5, $6
       FROM (${candidatesSql}) x
     ON CONFLICT ON CONSTRAINT lapse_notices_once_key DO NOTHING
     RETURNING id`,
    [...params(w), runId, now],
  );
  if (created.length === 0) return 0;
  await db.query(
    `INSERT INTO notice_deliveries (notice_id, user_id, email, status, attempts, next_attempt_at)
     SELECT n.id, u.id, u.email, 'pending', 0, $2
       FROM lapse_notices n
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
       JOIN users u ON u.organization_id = n.organization_id AND u.active
        AND (u.role = 'qa_manager'
             OR (u.role = 'foreman'
                 AND EXISTS (SELECT 1 FROM foreman_shops fs WHERE fs.user_id = u.id AND fs.shop_id = w.home_shop_id)))
      WHERE n.id = ANY($1::uuid[])
     ON CONFLICT ON CONSTRAINT notice_deliveries_once_key DO NOTHING`,
    [created.map((c) => c.id), now],
  );
  return created.length;
}

export interface Recipient {
  id: string;
  name: string;
  email: string;
  role: 'qa_manager' | 'foreman';
  shopIds: string[];
}

/** Active QA managers and foremen of a company, with the foremen's shops. */
export async function recipientsOf(db: EntityManager, organizationId: string): Promise<Recipient[]> {
  return db.query<Recipient[]>(
    `SELECT u.id, u.name, u.email, u.role,
            coalesce(array_agg(fs.shop_id) FILTER (WHERE fs.shop_id IS NOT NULL), '{}') AS "shopIds"
       FROM users u LEFT JOIN foreman_shops fs ON fs.user_id = u.id
      WHERE u.organization_id = $1 AND u.active AND u.role IN ('qa_manager', 'foreman')
      GROUP BY u.id
      ORDER BY u.role DESC, u.name`,
    [organizationId],
  );
}

/** The as-of day of the company's latest completed run before asOf. */
export async function previousRunDay(db: EntityManager, organizationId: string, asOf: string) {
  const [row] = await db.query<{ day: string | null }[]>(
    `SELECT to_char(max(as_of), 'YYYY-MM-DD') AS day FROM lapse_watch_runs
      WHERE organization_id = $1 AND status = 'done' AND as_of < $2::date`,
    [organizationId, asOf],
  );
  return row?.day ?? null;
}

/** Recipients with deliveries of this company due at `now`. */
export async function dueRecipients(db: EntityManager, organizationId: string, now: Date): Promise<string[]> {
  const rows = await db.query<{ userId: string }[]>(
    `SELECT DISTINCT d.user_id AS "userId"
       FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id
      WHERE n.organization_id = $1 AND d.status = 'pending' AND d.next_attempt_at <= $2`,
    [organizationId, now],
  );
  return rows.map((r) => r.userId);
}

export interface DigestLine {
  deliveryId: string;
  email: string;
  recipientName: string;
  attempts: number;
  qualificationId: string;
  welderId: string;
  stamp: string;
  name: string;
  process: string;
  code: string;
  threshold: string;
  lapsesOn: string;
  lastUse: string | null;
}

/** Claims a recipient's due deliveries (row locks held until the caller's transaction ends). */
export async function claimDueDeliveries(
  db: EntityManager,
  organizationId: string,
  userId: string,
  now: Date,
): Promise<DigestLine[]> {
  return db.query<DigestLine[]>(
    `SELECT d.id AS "deliveryId", d.email, u.name AS "recipientName", d.attempts,
            q.id AS "qualificationId", w.id AS "welderId", w.stamp, w.name, q.process, q.code, n.threshold,
            to_char(n.lapses_on, 'YYYY-MM-DD') AS "lapsesOn", to_char(cs.last_evidence, 'YYYY-MM-DD') AS "lastUse"
       FROM notice_deliveries d
       JOIN users u ON u.id = d.user_id
       JOIN lapse_notices n ON n.id = d.notice_id
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
       LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
      WHERE d.user_id = $2 AND n.organization_id = $1 AND d.status = 'pending' AND d.next_attempt_at <= $3
      ORDER BY n.lapses_on, w.stamp, q.process, n.threshold
        FOR UPDATE OF d SKIP LOCKED`,
    [organizationId, userId, now],
  );
}

export async function markSent(db: EntityManager, ids: string[], now: Date): Promise<void> {
  await db.query(
    `UPDATE notice_deliveries SET status = 'sent', sent_at = $2, attempts = attempts + 1, last_error = NULL,
            next_attempt_at = NULL
      WHERE id = ANY($1::uuid[])`,
    [ids, now],
  );
}

/** A failed send: retried after 15 min × 2^(earlier attempts), at most 24 h; after `maxAttempts` it is failed. */
export async function markFailed(
  db: EntityManager,
  ids: string[],
  now: Date,
  error: string,
  maxAttempts: number,
): Promise<void> {
  await db.query(
    `UPDATE notice_deliveries
        SET attempts = attempts + 1, last_error = $3,
            status = CASE WHEN attempts + 1 >= $4 THEN 'failed' ELSE 'pending' END,
            next_attempt_at = CASE WHEN attempts + 1 >= $4 THEN NULL
                                   ELSE $2::timestamptz + least(interval '15 minutes' * power(2, attempts), interval '24 hours') END
      WHERE id = ANY($1::uuid[])`,
    [ids, now, error.slice(0, 500), maxAttempts],
  );
}

const runColumns = `id, organization_id AS "organizationId", to_char(as_of, 'YYYY-MM-DD') AS "asOf",
  started_at AS "startedAt", finished_at AS "finishedAt", trigger, instance, status,
  notices_created AS "noticesCreated", emails_sent AS "emailsSent", emails_failed AS "emailsFailed", error`;

type RunRaw = Omit<LapseWatchRun, 'startedAt' | 'finishedAt'> & { startedAt: Date; finishedAt: Date | null };
const toRun = (r: RunRaw): LapseWatchRun => ({
  ...r,
  startedAt: r.startedAt.toISOString(),
  finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
});

export async function insertRun(
  db: EntityManager,
  run: Pick<LapseWatchRun, 'organizationId' | 'asOf' | 'trigger' | 'instance' | 'status'> & {
    startedAt: Date;
    finishedAt: Date | null;
    error?: string | null;
  },
): Promise<string> {
  const [row] = await db.query<{ id: string }[]>(
    `INSERT INTO lapse_watch_runs (organization_id, as_of, started_at, finished_at, trigger, instance, status, error)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8) RETURNING id`,
    [
      run.organizationId,
      run.asOf,
      run.startedAt,
      run.finishedAt,
      run.trigger,
      run.instance,
      run.status,
      run.error ?? null,
    ],
  );
  return row!.id;
}

export async function finishRun(
  db: EntityManager,
  id: string,
  r: {
    status: 'done' | 'failed';
    noticesCreated: number;
    emailsSent: number;
    emailsFailed: number;
    error: string | null;
    finishedAt: Date;
  },
): Promise<void> {
  await db.query(
    `UPDATE lapse_watch_runs SET status = $2, notices_created = $3, emails_sent = $4, emails_failed = $5,
            error = $6, finished_at = $7 WHERE id = $1`,
    [id, r.status, r.noticesCreated, r.emailsSent, r.emailsFailed, r.error, r.finishedAt],
  );
}

export async function findRun(db: EntityManager, id: string): Promise<LapseWatchRun | null> {
  const [row] = await db.query<RunRaw[]>(`SELECT ${runColumns} FROM lapse_watch_runs WHERE id = $1`, [id]);
  return row ? toRun(row) : null;
}

/** Runs a company's QA manager sees: its own, and skipped runs of all companies. */
export async function listRuns(
  db: EntityManager,
  organizationId: string,
  limit: number,
): Promise<LapseWatchRun[]> {
  const rows = await db.query<RunRaw[]>(
    `SELECT ${runColumns} FROM lapse_watch_runs
      WHERE organization_id = $1 OR organization_id IS NULL
      ORDER BY started_at DESC, id DESC LIMIT $2`,
    [organizationId, limit],
  );
  return rows.map(toRun);
}

export interface NoticeRaw {
  id: string;
  qualificationId: string;
  welder: { id: string; stamp: string; name: string };
  process: string;
  code: string;
  threshold: string;
  lapsesOn: string;
  createdAt: Date;
  runId: string | null;
  deliveries: {
    userId: string;
    name: string;
    email: string;
    status: 'pending' | 'sent' | 'failed';
    attempts: number;
    nextAttemptAt: string | null;
    lastError: string | null;
    sentAt: string | null;
  }[];
}

/** The newest notices of a company with their deliveries; `status` keeps notices having a delivery in it. */
export async function listNotices(
  db: EntityManager,
  organizationId: string,
  status: string | null,
  limit: number,
): Promise<NoticeRaw[]> {
  return db.query<NoticeRaw[]>(
    `SELECT n.id, n.qualification_id AS "qualificationId",
            json_build_object('id', w.id, 'stamp', w.stamp, 'name', w.name) AS welder,
            q.process, q.code, n.threshold, to_char(n.lapses_on, 'YYYY-MM-DD') AS "lapsesOn",
            n.created_at AS "createdAt", n.run_id AS "runId",
            coalesce((SELECT json_agg(json_build_object(
                        'userId', d.user_id, 'name', u.name, 'email', d.email, 'status', d.status,
                        'attempts', d.attempts, 'nextAttemptAt', d.next_attempt_at, 'lastError', d.last_error,
                        'sentAt', d.sent_at) ORDER BY u.name)
                        FROM notice_deliveries d JOIN users u ON u.id = d.user_id
                       WHERE d.notice_id = n.id), '[]') AS deliveries
       FROM lapse_notices n
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
      WHERE n.organization_id = $1
        AND ($2::text IS NULL OR EXISTS (SELECT 1 FROM notice_deliveries d WHERE d.notice_id = n.id AND d.status = $2))
      ORDER BY n.created_at DESC, n.lapses_on, w.stamp
      LIMIT $3`,
    [organizationId, status, limit],
  );
}

/** Companies whose daily time has come today (server time) and that have no scheduled run for today yet. */
export async function dueCompanies(
  db: EntityManager,
  today: string,
  hhmm: string,
  among: string[] | null,
): Promise<string[]> {
  const rows = await db.query<{ id: string }[]>(
    `SELECT o.id FROM organizations o LEFT JOIN company_settings s ON s.organization_id = o.id
      WHERE coalesce(s.lapse_watch_time, $3) <= $2 AND ($4::uuid[] IS NULL OR o.id = ANY($4::uuid[]))
        AND NOT EXISTS (SELECT 1 FROM lapse_watch_runs r
                         WHERE r.organization_id = o.id AND r.as_of = $1::date AND r.trigger = 'schedule' AND r.status = 'done')`,
    [today, hhmm, DEFAULT_COMPANY_SETTINGS.lapseWatchTime, among],
  );
  return rows.map((r) => r.id);
}

/** The companies a run covers: the given ones, or all. */
export async function companiesOf(
  db: EntityManager,
  organizationIds: string[] | null,
): Promise<{ id: string; name: string }[]> {
  return db.query<{ id: string; name: string }[]>(
    `SELECT id, name FROM organizations WHERE $1::uuid[] IS NULL OR id = ANY($1::uuid[]) ORDER BY created_at, id`,
    [organizationIds],
  );
}
