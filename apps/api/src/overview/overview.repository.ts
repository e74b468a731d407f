// The Overview's numbers in one statement over the maintained continuity_states: counts by state per
// shop, lapses due per week, the review queue, given-up deliveries and the latest lapse-watch run. One
// round trip, prepared once per connection (lib/prepared.ts); the page used to cost seven queries.
import type { EntityManager } from 'typeorm';
import type { Overview } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import { preparedQuery } from '../lib/prepared.js';
import { companyWarnDaysSql, qualificationStateSql } from '../continuity/continuity-state.repository.js';

export type OverviewNumbers = Omit<Overview, 'asOf'>;

// The state of a qualification at $2 with the company's largest lead time, decided by the one SQL
// expression the continuity feature uses for every list.
const stateSql = qualificationStateSql('q', 'cs', '$2::date', companyWarnDaysSql('$1'));
const isoInstant = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

/**
 * $1 company, $2 today (the company's), $3 horizon in days, and for a foreman $4 their shops, $5 their
 * user id. QA manager: every active shop, every given-up delivery. Foreman: their shops (home shop of
 * the welder, shop of the logged entry) and their own deliveries.
 */
function overviewSql(scoped: boolean): string {
  return `WITH st AS (
       SELECT w.home_shop_id AS shop_id, ${stateSql} AS state
         FROM qualifications q
         JOIN welders w ON w.id = q.welder_id AND w.active
         LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
        WHERE q.organization_id = $1 AND q.superseded_by_id IS NULL
     ), counts AS (
       SELECT s.id, s.name, s.code,
              count(st.state) FILTER (WHERE st.state = 'current')::int AS current,
              count(st.state) FILTER (WHERE st.state = 'lapsing')::int AS lapsing,
              count(st.state) FILTER (WHERE st.state = 'lapsed')::int AS lapsed,
              count(st.state) FILTER (WHERE st.state = 'revoked')::int AS revoked
         FROM shops s LEFT JOIN st ON st.shop_id = s.id
        WHERE s.organization_id = $1 AND s.active ${scoped ? 'AND s.id = ANY($4::uuid[])' : ''}
        GROUP BY s.id, s.name, s.code
     ), due AS (
       SELECT date_trunc('week', cs.lapses_on)::date AS week
         FROM continuity_states cs
         JOIN qualifications q ON q.welder_id = cs.welder_id AND q.process = cs.process AND q.code = cs.code
         JOIN welders w ON w.id = q.welder_id AND w.active
        WHERE cs.organization_id = $1 AND cs.lapses_on > $2::date AND cs.lapses_on <= $2::date + $3::int
          AND q.organization_id = $1 AND q.superseded_by_id IS NULL
          AND (q.revoked_on IS NULL OR q.revoked_on > $2::date) ${scoped ? 'AND w.home_shop_id = ANY($4::uuid[])' : ''}
     ), weeks AS (
       SELECT g.week, count(due.week)::int AS count
         FROM generate_series(date_trunc('week', $2::date + 1), date_trunc('week', $2::date + $3::int), interval '1 week') AS g(week)
         LEFT JOIN due ON due.week = g.week::date
        GROUP BY g.week
     )
     SELECT
       (SELECT coalesce(json_agg(json_build_object(
                 'shop', json_build_object('id', c.id, 'name', c.name, 'code', c.code),
                 'current', c.current, 'lapsing', c.lapsing, 'lapsed', c.lapsed, 'revoked', c.revoked)
               ORDER BY c.code), '[]') FROM counts c) AS counts,
       (SELECT coalesce(json_agg(json_build_object('weekStart', to_char(wk.week, 'YYYY-MM-DD'), 'count', wk.count)
               ORDER BY wk.week), '[]') FROM weeks wk) AS "lapsesByWeek",
       (SELECT count(*)::int FROM continuity_entries e
         WHERE e.organization_id = $1 AND e.flagged_lapsed AND e.review_status = 'pending'
               ${scoped ? 'AND e.shop_id = ANY($4::uuid[])' : ''}) AS "reviewQueue",
       (SELECT count(*)::int FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id
         WHERE n.organization_id = $1 AND d.status = 'failed' ${scoped ? 'AND d.user_id = $5' : ''}) AS "failedDeliveries",
       (SELECT json_build_object('id', r.id, 'organizationId', r.organization_id, 'asOf', to_char(r.as_of, 'YYYY-MM-DD'),
                 'startedAt', ${isoInstant('r.started_at')},
                 'finishedAt', CASE WHEN r.finished_at IS NULL THEN NULL ELSE ${isoInstant('r.finished_at')} END,
                 'trigger', r.trigger, 'status', r.status, 'noticesCreated', r.notices_created,
                 'emailsSent', r.emails_sent, 'emailsFailed', r.emails_failed,
                 'emailsSuperseded', r.emails_superseded, 'error', r.error)
          FROM lapse_watch_runs r WHERE r.organization_id = $1
         ORDER BY r.started_at DESC, r.id DESC LIMIT 1) AS "latestRun"`;
}

const qaSql = overviewSql(false);
const foremanSql = overviewSql(true);

export async function overviewNumbers(
  db: EntityManager,
  actor: Actor,
  asOf: string,
  horizonDays: number,
): Promise<OverviewNumbers> {
  const [row] =
    actor.role === 'qa_manager'
      ? await preparedQuery<OverviewNumbers>(db, qaSql, [actor.organizationId, asOf, horizonDays])
      : await preparedQuery<OverviewNumbers>(db, foremanSql, [actor.organizationId, asOf, horizonDays, actor.shopIds, actor.id]);
  return row!;
}

