// The SQL of lapse watch. The scan reads continuity_states through its (organization_id, lapses_on)
// index; notices and deliveries are written set-based with ON CONFLICT DO NOTHING, so a rerun, a backfill
// or a second instance never duplicates one; digests claim their deliveries with FOR UPDATE SKIP LOCKED.
import type { EntityManager } from 'typeorm';
import type { LapseWatchRun } from '@beadroll/rules';
import type { DigestWeld } from './digest-mail.js';

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
  await addDeliveries(
    db,
    created.map((c) => c.id),
    now,
  );
  return created.length;
}

/**
 * Who is told about a shop's work: the company's active QA managers, and the active foremen of the shop
 * (SQL condition on users `u`, given the company and shop expressions).
 */
const supervisesShopSql = (u: string, org: string, shop: string) => `(${u}.active AND ${u}.organization_id = ${org}
  AND (${u}.role = 'qa_manager'
       OR (${u}.role = 'foreman'
           AND EXISTS (SELECT 1 FROM foreman_shops fs WHERE fs.user_id = ${u}.id AND fs.shop_id = ${shop}))))`;

/** Who is told about a welder: as above, for the welder's home shop as it is now (users `u`, welders `w`). */
export const supervisesSql = (u: string, w: string) => supervisesShopSql(u, `${w}.organization_id`, `${w}.home_shop_id`);

/** Who is told about a weld: as above, for the shop the weld was made in (users `u`, welds `wd`). */
const supervisesWeldSql = (u: string, wd: string) => supervisesShopSql(u, `${wd}.organization_id`, `${wd}.shop_id`);

/** A pending delivery of each given notice to each of its recipients (none twice). */
export async function addDeliveries(db: EntityManager, noticeIds: string[], now: Date): Promise<void> {
  if (noticeIds.length === 0) return;
  await db.query(
    `INSERT INTO notice_deliveries (notice_id, user_id, email, status, attempts, next_attempt_at)
     SELECT n.id, u.id, u.email, 'pending', 0, $2
       FROM lapse_notices n
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
       JOIN users u ON ${supervisesSql('u', 'w')}
      WHERE n.id = ANY($1::uuid[])
     ON CONFLICT ON CONSTRAINT notice_deliveries_once_key DO NOTHING`,
    [noticeIds, now],
  );
}

/** Notices of a lapse move, written by the refresh that moved it (lapse-events.ts decides which). */
export async function insertMoveNotices(
  db: EntityManager,
  organizationId: string,
  rows: { qualificationId: string; threshold: string; lapsesOn: string }[],
  now: Date,
): Promise<number> {
  if (rows.length === 0) return 0;
  const created = await db.query<{ id: string }[]>(
    `INSERT INTO lapse_notices (organization_id, qualification_id, threshold, lapses_on, run_id, created_at)
     SELECT $1, x.q, x.t, x.d, NULL, $5
       FROM unnest($2::uuid[], $3::text[], $4::date[]) AS x(q, t, d)
     ON CONFLICT ON CONSTRAINT lapse_notices_once_key DO NOTHING
     RETURNING id`,
    [
      organizationId,
      rows.map((r) => r.qualificationId),
      rows.map((r) => r.threshold),
      rows.map((r) => r.lapsesOn),
      now,
    ],
  );
  await addDeliveries(
    db,
    created.map((c) => c.id),
    now,
  );
  return created.length;
}

/** The qualifications in force behind moved pairs, and whether anyone was sent a notice of the old date. */
export async function movedQualifications(
  db: EntityManager,
  organizationId: string,
  today: string,
  moves: { welderId: string; process: string; code: string; before: string | null; after: string | null }[],
): Promise<{ qualificationId: string; before: string | null; after: string; told: boolean }[]> {
  return db.query(
    `SELECT q.id AS "qualificationId", to_char(m.before, 'YYYY-MM-DD') AS before, to_char(m.after, 'YYYY-MM-DD') AS after,
            EXISTS (SELECT 1 FROM lapse_notices n JOIN notice_deliveries d ON d.notice_id = n.id
                     WHERE n.qualification_id = q.id AND n.lapses_on = m.before AND n.threshold <> 'restored'
                       AND d.status = 'sent') AS told
       FROM unnest($2::uuid[], $3::text[], $4::text[], $5::date[], $6::date[])
              AS m(welder_id, process, code, before, after)
       JOIN qualifications q ON q.welder_id = m.welder_id AND q.process = m.process AND q.code = m.code
       JOIN welders w ON w.id = q.welder_id
      WHERE q.organization_id = $1 AND w.active AND q.superseded_by_id IS NULL
        AND (q.revoked_on IS NULL OR q.revoked_on > $7::date)
        AND m.after IS NOT NULL`,
    [
      organizationId,
      moves.map((m) => m.welderId),
      moves.map((m) => m.process),
      moves.map((m) => m.code),
      moves.map((m) => m.before),
      moves.map((m) => m.after),
      today,
    ],
  );
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
      WHERE organization_id = $1 AND status IN ('sending', 'done') AND as_of < $2::date`,
    [organizationId, asOf],
  );
  return row?.day ?? null;
}

/** Deliveries still being delivered reach whoever supervises the welder now (a welder moved shops). */
export async function addNewSupervisors(db: EntityManager, organizationIds: string[] | null, now: Date): Promise<void> {
  await db.query(
    `INSERT INTO notice_deliveries (notice_id, user_id, email, status, attempts, next_attempt_at)
     SELECT n.id, u.id, u.email, 'pending', 0, $2
       FROM lapse_notices n
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
       JOIN users u ON ${supervisesSql('u', 'w')}
      WHERE ($1::uuid[] IS NULL OR n.organization_id = ANY($1::uuid[]))
        AND n.id IN (SELECT d.notice_id FROM notice_deliveries d WHERE d.status = 'pending')
     ON CONFLICT ON CONSTRAINT notice_deliveries_once_key DO NOTHING`,
    [organizationIds, now],
  );
  await db.query(
    weldDeliveriesSql(`($1::uuid[] IS NULL OR n.organization_id = ANY($1::uuid[]))
        AND n.id IN (SELECT d.weld_notice_id FROM notice_deliveries d WHERE d.status = 'pending')`),
    [organizationIds, now],
  );
}

/** A pending delivery (at $2) of the weld notices `n` matching `where` to each supervisor of the weld's shop. */
const weldDeliveriesSql = (where: string) =>
  `INSERT INTO notice_deliveries (weld_notice_id, user_id, email, status, attempts, next_attempt_at)
   SELECT n.id, u.id, u.email, 'pending', 0, $2
     FROM weld_flag_notices n
     JOIN welds wd ON wd.id = n.weld_id
     JOIN users u ON ${supervisesWeldSql('u', 'wd')}
    WHERE ${where}
   ON CONFLICT ON CONSTRAINT notice_deliveries_weld_once_key DO NOTHING`;

/**
 * Notices of welds that a re-check has just flagged, written in the re-check's transaction, with a
 * pending delivery to each supervisor of the weld's shop. One per weld and flag: a weld flagged, cleared
 * and flagged again is told about again.
 */
export async function insertWeldFlagNotices(
  db: EntityManager,
  organizationId: string,
  weldIds: string[],
  flaggedAt: Date,
  cause: string,
): Promise<number> {
  if (weldIds.length === 0) return 0;
  const created = await db.query<{ id: string }[]>(
    `INSERT INTO weld_flag_notices (organization_id, weld_id, flagged_at, cause, created_at)
     SELECT $1, x.id, $3, $4, $3 FROM unnest($2::uuid[]) AS x(id)
     ON CONFLICT ON CONSTRAINT weld_flag_notices_once_key DO NOTHING
     RETURNING id`,
    [organizationId, weldIds, flaggedAt, cause],
  );
  if (created.length === 0) return 0;
  await db.query(
    weldDeliveriesSql(`n.id = ANY($1::uuid[])`),
    [created.map((c) => c.id), flaggedAt],
  );
  return created.length;
}

// A delivery is of a lapse notice (n) or of a weld notice (wn); its company is that notice's.
const deliveriesWithCompany = `notice_deliveries d
  LEFT JOIN lapse_notices n ON n.id = d.notice_id
  LEFT JOIN weld_flag_notices wn ON wn.id = d.weld_notice_id`;
const deliveryCompany = `coalesce(n.organization_id, wn.organization_id)`;

/** (company, recipient) pairs with deliveries due at `now` and not claimed by a live sender. */
export async function dueRecipients(
  db: EntityManager,
  organizationIds: string[] | null,
  now: Date,
): Promise<{ organizationId: string; userId: string }[]> {
  return db.query(
    `SELECT DISTINCT ${deliveryCompany} AS "organizationId", d.user_id AS "userId"
       FROM ${deliveriesWithCompany}
      WHERE d.status = 'pending' AND d.next_attempt_at <= $2
        AND (d.claimed_until IS NULL OR d.claimed_until <= $2)
        AND ($1::uuid[] IS NULL OR ${deliveryCompany} = ANY($1::uuid[]))
      ORDER BY 1, 2`,
    [organizationIds, now],
  );
}

/**
 * Claims a recipient's due deliveries for `leaseMs` under `token` (one statement, committed at once):
 * a concurrent sender skips them, and if this sender dies the claim runs out and another takes over.
 */
export async function claimDue(
  db: EntityManager,
  organizationId: string,
  userId: string,
  token: string,
  now: Date,
  leaseMs: number,
): Promise<string[]> {
  const rows = await db.query<{ id: string }[]>(
    `WITH c AS (
       SELECT d.id FROM ${deliveriesWithCompany}
        WHERE d.user_id = $2 AND ${deliveryCompany} = $1 AND d.status = 'pending' AND d.next_attempt_at <= $4
          AND (d.claimed_until IS NULL OR d.claimed_until <= $4)
        FOR UPDATE OF d SKIP LOCKED),
     u AS (UPDATE notice_deliveries d SET claim_token = $3, claimed_until = $4::timestamptz + $5 * interval '1 millisecond'
             FROM c WHERE d.id = c.id RETURNING d.id)
     SELECT id FROM u`,
    [organizationId, userId, token, now, leaseMs],
  );
  return rows.map((r) => r.id);
}

export interface ClaimedLine {
  deliveryId: string;
  /** The recipient's e-mail address now (an address changed since the notice goes to the new one). */
  email: string;
  recipientName: string;
  qualificationId: string;
  welderId: string;
  stamp: string;
  name: string;
  process: string;
  code: string;
  threshold: string;
  lapsesOn: string;
  lastUse: string | null;
  /** Why the delivery no longer applies, or null when it still does. */
  stale: string | null;
}

/**
 * The claimed deliveries, each re-checked against the records as they are now (just before sending):
 * the recipient still active and supervising the welder, the welder still with the company, the
 * qualification neither renewed by a newer one nor revoked before the lapse, the pair's lapse date
 * unchanged, and a warning not overtaken by the lapse itself.
 */
export async function recheckClaimed(db: EntityManager, token: string, today: string): Promise<ClaimedLine[]> {
  return db.query<ClaimedLine[]>(
    `SELECT d.id AS "deliveryId", u.email, u.name AS "recipientName",
            q.id AS "qualificationId", w.id AS "welderId", w.stamp, w.name, q.process, q.code, n.threshold,
            to_char(n.lapses_on, 'YYYY-MM-DD') AS "lapsesOn", to_char(cs.last_evidence, 'YYYY-MM-DD') AS "lastUse",
            CASE
              WHEN NOT u.active THEN 'The recipient is no longer active'
              WHEN NOT ${supervisesSql('u', 'w')} THEN 'The recipient no longer supervises the welder''s shop'
              WHEN NOT w.active THEN 'The welder has left the company'
              WHEN q.superseded_by_id IS NOT NULL THEN 'The qualification was renewed by a newer one'
              WHEN q.revoked_on IS NOT NULL AND q.revoked_on <= greatest(n.lapses_on, $2::date)
                THEN 'The qualification was revoked on ' || to_char(q.revoked_on, 'YYYY-MM-DD')
              WHEN cs.lapses_on IS DISTINCT FROM n.lapses_on
                THEN 'The lapse date moved to ' || coalesce(to_char(cs.lapses_on, 'YYYY-MM-DD'), 'none')
              WHEN n.threshold ~ '^[0-9]+$' AND n.lapses_on <= $2::date THEN 'The qualification has lapsed since'
            END AS stale
       FROM notice_deliveries d
       JOIN users u ON u.id = d.user_id
       JOIN lapse_notices n ON n.id = d.notice_id
       JOIN qualifications q ON q.id = n.qualification_id
       JOIN welders w ON w.id = q.welder_id
       LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
      WHERE d.claim_token = $1 AND d.status = 'pending'
      ORDER BY n.lapses_on, w.stamp, q.process, n.threshold`,
    [token, today],
  );
}

/** A claimed weld delivery: the weld as the digest shows it, to whom, and why it no longer applies (or null). */
export type ClaimedWeldLine = DigestWeld & { deliveryId: string; email: string; recipientName: string; stale: string | null };

/**
 * The claimed weld deliveries, re-checked just before sending: the recipient still active and
 * supervising the weld's shop, and the weld still flagged and waiting for a disposition.
 */
export async function recheckClaimedWelds(db: EntityManager, token: string): Promise<ClaimedWeldLine[]> {
  return db.query<ClaimedWeldLine[]>(
    `SELECT d.id AS "deliveryId", u.email, u.name AS "recipientName", wd.id AS "weldId",
            wd.job_reference AS "jobReference", wd.weld_number AS "weldNumber",
            to_char(wd.welded_on, 'YYYY-MM-DD') AS "weldedOn", s.name AS "shopName", n.cause,
            coalesce((SELECT json_agg(json_build_object('stamp', w.stamp, 'name', w.name, 'process', p.process,
                                                        'reasons', p.reasons) ORDER BY p.position)
                        FROM weld_passes p JOIN welders w ON w.id = p.welder_id
                       WHERE p.weld_id = wd.id AND NOT p.qualified), '[]') AS passes,
            CASE
              WHEN NOT u.active THEN 'The recipient is no longer active'
              WHEN NOT ${supervisesWeldSql('u', 'wd')} THEN 'The recipient no longer supervises the weld''s shop'
              WHEN NOT wd.flagged THEN 'The weld is no longer flagged'
              WHEN wd.review_status IS DISTINCT FROM 'pending' THEN 'The weld has a disposition'
            END AS stale
       FROM notice_deliveries d
       JOIN users u ON u.id = d.user_id
       JOIN weld_flag_notices n ON n.id = d.weld_notice_id
       JOIN welds wd ON wd.id = n.weld_id
       JOIN shops s ON s.id = wd.shop_id
      WHERE d.claim_token = $1 AND d.status = 'pending'
      ORDER BY wd.welded_on, wd.job_reference, wd.weld_number`,
    [token],
  );
}

/** Drops claimed deliveries that no longer apply, each with its reason. */
export async function markSuperseded(
  db: EntityManager,
  token: string,
  lines: { deliveryId: string; reason: string }[],
  now: Date,
): Promise<void> {
  if (lines.length === 0) return;
  await db.query(
    `UPDATE notice_deliveries d SET status = 'superseded', superseded_reason = x.reason, settled_at = $4,
            claim_token = NULL, claimed_until = NULL, next_attempt_at = NULL
       FROM unnest($2::uuid[], $3::text[]) AS x(id, reason)
      WHERE d.id = x.id AND d.claim_token = $1 AND d.status = 'pending'`,
    [token, lines.map((l) => l.deliveryId), lines.map((l) => l.reason), now],
  );
}

/**
 * Records a digest the SMTP server accepted: one statement, straight after the acceptance. Returns how
 * many of the deliveries were still held by this claim (fewer means the claim ran out first and another
 * sender may send them again: the one duplicate that at-least-once delivery allows).
 */
export async function markSent(
  db: EntityManager,
  token: string,
  ids: string[],
  email: string,
  messageId: string,
  now: Date,
): Promise<number> {
  const [row] = await db.query<{ n: number }[]>(
    `WITH u AS (
       UPDATE notice_deliveries SET status = 'sent', sent_at = $4, settled_at = $4, attempts = attempts + 1,
              last_error = NULL, next_attempt_at = NULL, claim_token = NULL, claimed_until = NULL,
              email = $3, message_id = $5
        WHERE id = ANY($2::uuid[]) AND claim_token = $1 AND status = 'pending' RETURNING 1)
     SELECT count(*)::int AS n FROM u`,
    [token, ids, email, now, messageId],
  );
  return row?.n ?? 0;
}

/** A failed send: retried after 15 min × 2^(earlier attempts), at most 24 h; after `maxAttempts` it is failed. */
export async function markFailed(
  db: EntityManager,
  token: string,
  ids: string[],
  now: Date,
  error: string,
  maxAttempts: number,
): Promise<void> {
  await db.query(
    `UPDATE notice_deliveries
        SET attempts = attempts + 1, last_error = $4, claim_token = NULL, claimed_until = NULL,
            status = CASE WHEN attempts + 1 >= $5 THEN 'failed' ELSE 'pending' END,
            settled_at = CASE WHEN attempts + 1 >= $5 THEN $3::timestamptz END,
            next_attempt_at = CASE WHEN attempts + 1 >= $5 THEN NULL
                                   ELSE $3::timestamptz + least(interval '15 minutes' * power(2, attempts), interval '24 hours') END
      WHERE id = ANY($2::uuid[]) AND claim_token = $1 AND status = 'pending'`,
    [token, ids, now, error.slice(0, 500), maxAttempts],
  );
}

/**
 * Brings the open runs of these companies up to date: their counts from their notices' deliveries, and
 * 'done' once none of those deliveries is pending any more.
 */
export async function settleRuns(db: EntityManager, organizationIds: string[] | null, now: Date): Promise<void> {
  await db.query(
    `UPDATE lapse_watch_runs r
        SET emails_sent = x.sent, emails_failed = x.failed, emails_superseded = x.superseded,
            status = CASE WHEN x.pending = 0 THEN 'done' ELSE 'sending' END,
            finished_at = CASE WHEN x.pending = 0 THEN $2::timestamptz END
       FROM (SELECT r2.id,
                    count(DISTINCT d.message_id) FILTER (WHERE d.status = 'sent')::int AS sent,
                    count(DISTINCT d.user_id) FILTER (WHERE d.status = 'failed')::int AS failed,
                    count(*) FILTER (WHERE d.status = 'superseded')::int AS superseded,
                    count(*) FILTER (WHERE d.status = 'pending')::int AS pending
               FROM lapse_watch_runs r2
               LEFT JOIN lapse_notices n ON n.run_id = r2.id
               LEFT JOIN notice_deliveries d ON d.notice_id = n.id
              WHERE r2.status = 'sending' AND ($1::uuid[] IS NULL OR r2.organization_id = ANY($1::uuid[]))
              GROUP BY r2.id) x
      WHERE r.id = x.id`,
    [organizationIds, now],
  );
}

const runColumns = `id, organization_id AS "organizationId", to_char(as_of, 'YYYY-MM-DD') AS "asOf",
  started_at AS "startedAt", finished_at AS "finishedAt", trigger, status,
  notices_created AS "noticesCreated", emails_sent AS "emailsSent", emails_failed AS "emailsFailed",
  emails_superseded AS "emailsSuperseded", error`;

type RunRaw = Omit<LapseWatchRun, 'startedAt' | 'finishedAt'> & { startedAt: Date; finishedAt: Date | null };
const toRun = (r: RunRaw): LapseWatchRun => ({
  ...r,
  startedAt: r.startedAt.toISOString(),
  finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
});

export async function insertRun(
  db: EntityManager,
  run: Pick<LapseWatchRun, 'asOf' | 'trigger' | 'status'> & {
    organizationId: string;
    /** host:pid of the instance, for the logs and the database (never shown to users). */
    instance: string;
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

export async function setNoticesCreated(db: EntityManager, id: string, noticesCreated: number): Promise<void> {
  await db.query(`UPDATE lapse_watch_runs SET notices_created = $2 WHERE id = $1`, [id, noticesCreated]);
}

export async function findRun(db: EntityManager, id: string): Promise<LapseWatchRun | null> {
  const [row] = await db.query<RunRaw[]>(`SELECT ${runColumns} FROM lapse_watch_runs WHERE id = $1`, [id]);
  return row ? toRun(row) : null;
}

/** The runs of one company (skipped ones included: each is stored with the company it was for). */
export async function listRuns(
  db: EntityManager,
  organizationId: string,
  limit: number,
): Promise<LapseWatchRun[]> {
  const rows = await db.query<RunRaw[]>(
    `SELECT ${runColumns} FROM lapse_watch_runs
      WHERE organization_id = $1
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
    status: 'pending' | 'sent' | 'failed' | 'superseded';
    attempts: number;
    nextAttemptAt: string | null;
    lastError: string | null;
    sentAt: string | null;
    supersededReason: string | null;
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
                        'sentAt', d.sent_at, 'supersededReason', d.superseded_reason) ORDER BY u.name)
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

/** Companies among `ids` that already have a scheduled run (written or done) for their day. */
export async function scheduledRunDays(
  db: EntityManager,
  days: { organizationId: string; day: string }[],
): Promise<Set<string>> {
  if (days.length === 0) return new Set();
  const rows = await db.query<{ id: string }[]>(
    `SELECT DISTINCT r.organization_id AS id
       FROM unnest($1::uuid[], $2::date[]) AS x(organization_id, day)
       JOIN lapse_watch_runs r ON r.organization_id = x.organization_id AND r.as_of = x.day
      WHERE r.trigger = 'schedule' AND r.status IN ('sending', 'done')`,
    [days.map((d) => d.organizationId), days.map((d) => d.day)],
  );
  return new Set(rows.map((r) => r.id));
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
