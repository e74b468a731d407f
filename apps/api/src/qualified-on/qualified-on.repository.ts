// The rows behind "was this welder qualified for this joint on that day?": the welder, every qualification
// of the process with its coupon and WPS, and the continuity walk of the welder's pairs cut at the day, so
// the state is the one the evidence known on that day gave — not today's (a pair lapsed then and renewed
// since reads lapsed on a day inside the gap).
import type { EntityManager } from 'typeorm';
import { walkCtes } from '../continuity/continuity-state.repository.js';

export interface ProofWelder {
  id: string;
  name: string;
  stamp: string;
  homeShop: string;
}

export async function findWelderInCompany(
  db: EntityManager,
  organizationId: string,
  welderId: string,
): Promise<ProofWelder | null> {
  const [row] = await db.query<ProofWelder[]>(
    `SELECT w.id, w.name, w.stamp, s.name AS "homeShop"
       FROM welders w JOIN shops s ON s.id = w.home_shop_id
      WHERE w.organization_id = $1 AND w.id = $2`,
    [organizationId, welderId],
  );
  return row ?? null;
}

export interface ProofQualificationRow {
  id: string;
  number: string;
  code: string;
  process: string;
  ranges: Record<string, unknown>;
  certifiedOn: string;
  certifiedBy: string;
  rulesVersion: string;
  revokedOn: string | null;
  revokedReason: string | null;
  revokedBy: string | null;
  supersededById: string | null;
  supersededByNumber: string | null;
  supersededByTestedOn: string | null;
  couponId: string;
  testedOn: string;
  testPosition: string;
  result: string;
  visual: string;
  examination: Record<string, unknown>;
  labReportNumber: string;
  wps: string;
  couponShop: string;
}

/** Every qualification of the welder for the process (and code), superseded and revoked ones too. */
export async function qualificationsOf(
  db: EntityManager,
  organizationId: string,
  welderId: string,
  process: string,
  code: string | undefined,
): Promise<ProofQualificationRow[]> {
  return db.query<ProofQualificationRow[]>(
    `SELECT q.id, q.number, q.code, q.process, q.ranges, to_char(q.certified_on, 'YYYY-MM-DD') AS "certifiedOn",
            q.certified_by_name AS "certifiedBy", q.rules_version AS "rulesVersion",
            to_char(q.revoked_on, 'YYYY-MM-DD') AS "revokedOn", q.revoked_reason AS "revokedReason",
            rb.name AS "revokedBy", q.superseded_by_id AS "supersededById", sq.number AS "supersededByNumber",
            to_char(sc.tested_on, 'YYYY-MM-DD') AS "supersededByTestedOn",
            c.id AS "couponId", to_char(c.tested_on, 'YYYY-MM-DD') AS "testedOn",
            coalesce(c.coupon->>'position', '') AS "testPosition", c.result, c.visual, c.examination,
            c.lab_report_number AS "labReportNumber", p.number || ' rev. ' || p.revision AS wps, cs.name AS "couponShop"
       FROM qualifications q
       JOIN coupons c ON c.id = q.coupon_id
       JOIN procedures p ON p.id = c.procedure_id
       JOIN shops cs ON cs.id = c.shop_id
       LEFT JOIN users rb ON rb.id = q.revoked_by
       LEFT JOIN qualifications sq ON sq.id = q.superseded_by_id
       LEFT JOIN coupons sc ON sc.id = sq.coupon_id
      WHERE q.organization_id = $1 AND q.welder_id = $2 AND q.process = $3 AND ($4::text IS NULL OR q.code = $4)
      ORDER BY c.tested_on, q.certified_on, q.number`,
    [organizationId, welderId, process, code ?? null],
  );
}

export interface PairAsOf {
  code: string;
  qualifiedOn: string;
  lastEvidence: string;
  lastTest: string;
  lapsesOn: string;
  renewedOn: string | null;
}

export interface WalkRowAsOf {
  code: string;
  date: string;
  kind: 'test' | 'use';
  entryId: string | null;
  /** Outside the pair's life (before its qualification date, on or after its revocation). */
  outside: boolean;
  counted: boolean;
  renewal: boolean;
}

/**
 * The pairs of the welder and process as of the day (evidence after it plays no part) and every row of
 * their walk, from one statement: the same walk that maintains continuity_states, cut at the day.
 */
export async function walkAsOf(
  db: EntityManager,
  welderId: string,
  process: string,
  date: string,
): Promise<{ pairs: PairAsOf[]; rows: WalkRowAsOf[] }> {
  const [row] = await db.query<{ pairs: PairAsOf[] | null; rows: WalkRowAsOf[] | null }[]>(
    `WITH ${walkCtes({ pairFilter: 'AND q.welder_id = $1 AND q.process = $2', asOf: '$3::date', entries: true })}
     SELECT (SELECT json_agg(json_build_object(
               'code', c.code, 'qualifiedOn', to_char(c.qualified_on, 'YYYY-MM-DD'),
               'lastEvidence', to_char(c.last_evidence, 'YYYY-MM-DD'), 'lastTest', to_char(c.last_test, 'YYYY-MM-DD'),
               'lapsesOn', to_char(c.lapses_on, 'YYYY-MM-DD'), 'renewedOn', to_char(c.renewed_on, 'YYYY-MM-DD')))
               FROM computed c) AS pairs,
            (SELECT json_agg(json_build_object(
               'code', w.code, 'date', to_char(w.d, 'YYYY-MM-DD'), 'kind', CASE WHEN w.k = 0 THEN 'test' ELSE 'use' END,
               'entryId', w.entry_id, 'outside', w.pre, 'counted', w.counted, 'renewal', w.renewal)
               ORDER BY w.code, w.d, w.k) FROM walk w) AS rows`,
    [welderId, process, date],
  );
  return { pairs: row?.pairs ?? [], rows: row?.rows ?? [] };
}

export interface EntryDetail {
  id: string;
  /** entry: a row of the continuity log; weld: a pass of a logged production weld. */
  source: 'entry' | 'weld';
  job: string;
  /** The weld or joint number, for a production weld. */
  weldNumber: string | null;
  weldId: string | null;
  note: string;
  shop: string;
  loggedBy: string | null;
  loggedAt: string;
  flagged: boolean;
  reviewStatus: string | null;
}

/**
 * The logged use behind walk rows — continuity-log entries and production weld passes (the walk carries
 * either id): job, weld number, shop, who logged it and when, its review flag.
 */
export async function entryDetails(db: EntityManager, ids: string[]): Promise<EntryDetail[]> {
  if (ids.length === 0) return [];
  return db.query<EntryDetail[]>(
    `SELECT e.id, 'entry' AS source, e.job_reference AS job, NULL AS "weldNumber", NULL AS "weldId", e.note,
            s.name AS shop, u.name AS "loggedBy",
            to_char(e.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "loggedAt",
            e.flagged_lapsed AS flagged, e.review_status AS "reviewStatus"
       FROM continuity_entries e JOIN shops s ON s.id = e.shop_id LEFT JOIN users u ON u.id = e.logged_by
      WHERE e.id = ANY ($1::uuid[])
     UNION ALL
     SELECT p.id, 'weld', w.job_reference, w.weld_number, w.id, w.note, s.name, u.name,
            to_char(w.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"'),
            NOT p.qualified, w.review_status
       FROM weld_passes p JOIN welds w ON w.id = p.weld_id JOIN shops s ON s.id = w.shop_id
       LEFT JOIN users u ON u.id = w.logged_by
      WHERE p.id = ANY ($1::uuid[])`,
    [ids],
  );
}

export interface CouponOnDay {
  id: string;
  code: string;
  testedOn: string;
  certified: boolean;
  shop: string;
  recordedBy: string | null;
  recordedAt: string;
}

/**
 * The welder's passing coupons of the process up to the day (the tests and coupon use in the walk); a
 * combination coupon counts for each of its processes, as in the walk.
 */
export async function passingCoupons(
  db: EntityManager,
  welderId: string,
  process: string,
  date: string,
): Promise<CouponOnDay[]> {
  return db.query<CouponOnDay[]>(
    `SELECT c.id, c.code, to_char(c.tested_on, 'YYYY-MM-DD') AS "testedOn",
            EXISTS (SELECT 1 FROM qualifications q WHERE q.coupon_id = c.id) AS certified, s.name AS shop,
            u.name AS "recordedBy", to_char(c.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS"Z"') AS "recordedAt"
       FROM coupons c JOIN shops s ON s.id = c.shop_id LEFT JOIN users u ON u.id = c.recorded_by
      WHERE c.welder_id = $1 AND $2 = ANY (c.processes) AND c.result = 'accept' AND c.tested_on <= $3::date
      ORDER BY c.tested_on`,
    [welderId, process, date],
  );
}
