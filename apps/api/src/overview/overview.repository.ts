// The Overview's numbers, each one set-based query over the maintained continuity_states.
import type { EntityManager } from 'typeorm';
import type { Actor } from '../lib/scope.js';
import { qualificationStateSql } from '../continuity/continuity-state.repository.js';

export interface ShopCounts {
  shop: { id: string; name: string; code: string };
  current: number;
  lapsing: number;
  lapsed: number;
  revoked: number;
}

// The state of a qualification at $2 with lead time $3 (the company's largest), decided by the one SQL
// expression the continuity feature uses for every list.
const stateSql = qualificationStateSql('q', 'cs', '$2::date', '$3::int');

/** Qualifications (not superseded) of active welders by state, per shop the actor sees (home shop). */
export async function countsByShop(
  db: EntityManager,
  actor: Actor,
  asOf: string,
  warnDays: number,
): Promise<ShopCounts[]> {
  const shopFilter = actor.role === 'qa_manager' ? '' : 'AND s.id = ANY($4::uuid[])';
  const rows = await db.query<
    {
      id: string;
      name: string;
      code: string;
      current: number;
      lapsing: number;
      lapsed: number;
      revoked: number;
    }[]
  >(
    `WITH st AS (
       SELECT w.home_shop_id AS shop_id, ${stateSql} AS state
         FROM qualifications q
         JOIN welders w ON w.id = q.welder_id AND w.active
         LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
        WHERE q.organization_id = $1 AND q.superseded_by_id IS NULL
     )
     SELECT s.id, s.name, s.code,
            count(st.state) FILTER (WHERE st.state = 'current')::int AS current,
            count(st.state) FILTER (WHERE st.state = 'lapsing')::int AS lapsing,
            count(st.state) FILTER (WHERE st.state = 'lapsed')::int AS lapsed,
            count(st.state) FILTER (WHERE st.state = 'revoked')::int AS revoked
       FROM shops s LEFT JOIN st ON st.shop_id = s.id
      WHERE s.organization_id = $1 AND s.active ${shopFilter}
      GROUP BY s.id, s.name, s.code
      ORDER BY s.code`,
    actor.role === 'qa_manager'
      ? [actor.organizationId, asOf, warnDays]
      : [actor.organizationId, asOf, warnDays, actor.shopIds],
  );
  return rows.map(({ id, name, code, ...counts }) => ({ shop: { id, name, code }, ...counts }));
}

/** Lapses due after asOf and within `days`, per week starting Monday, every week listed (zeros too). */
export async function lapsesByWeek(
  db: EntityManager,
  actor: Actor,
  asOf: string,
  days: number,
): Promise<{ weekStart: string; count: number }[]> {
  const shopFilter = actor.role === 'qa_manager' ? '' : 'AND w.home_shop_id = ANY($4::uuid[])';
  return db.query<{ weekStart: string; count: number }[]>(
    `WITH due AS (
       SELECT date_trunc('week', cs.lapses_on)::date AS week
         FROM continuity_states cs
         JOIN qualifications q ON q.welder_id = cs.welder_id AND q.process = cs.process AND q.code = cs.code
         JOIN welders w ON w.id = q.welder_id AND w.active
        WHERE cs.organization_id = $1 AND cs.lapses_on > $2::date AND cs.lapses_on <= $2::date + $3::int
          AND q.organization_id = $1 AND q.superseded_by_id IS NULL
          AND (q.revoked_on IS NULL OR q.revoked_on > $2::date) ${shopFilter}
     )
     SELECT to_char(g.week, 'YYYY-MM-DD') AS "weekStart", count(due.week)::int AS count
       FROM generate_series(date_trunc('week', $2::date + 1), date_trunc('week', $2::date + $3::int), interval '1 week') AS g(week)
       LEFT JOIN due ON due.week = g.week::date
      GROUP BY g.week ORDER BY g.week`,
    actor.role === 'qa_manager'
      ? [actor.organizationId, asOf, days]
      : [actor.organizationId, asOf, days, actor.shopIds],
  );
}

/** Deliveries given up after repeated failures, for the actor's scope (QA all; foreman their own). */
export async function failedDeliveries(db: EntityManager, actor: Actor): Promise<number> {
  const [row] = await db.query<{ n: number }[]>(
    `SELECT count(*)::int AS n FROM notice_deliveries d JOIN lapse_notices n ON n.id = d.notice_id
      WHERE n.organization_id = $1 AND d.status = 'failed' ${actor.role === 'qa_manager' ? '' : 'AND d.user_id = $2'}`,
    actor.role === 'qa_manager' ? [actor.organizationId] : [actor.organizationId, actor.id],
  );
  return row?.n ?? 0;
}

/** Flagged continuity entries awaiting the QA manager's review (a foreman: logged in their shops). */
export async function reviewQueue(db: EntityManager, actor: Actor): Promise<number> {
  const shopFilter = actor.role === 'qa_manager' ? '' : 'AND e.shop_id = ANY($2::uuid[])';
  const [row] = await db.query<{ n: number }[]>(
    `SELECT count(*)::int AS n FROM continuity_entries e
      WHERE e.organization_id = $1 AND e.flagged_lapsed AND e.review_status = 'pending' ${shopFilter}`,
    actor.role === 'qa_manager' ? [actor.organizationId] : [actor.organizationId, actor.shopIds],
  );
  return row?.n ?? 0;
}
