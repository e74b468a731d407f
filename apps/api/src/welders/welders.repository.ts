// Welders in PostgreSQL. The list is one set-based query carrying its total, scoped as lib/scope scopes.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { Welder, welderListQuery } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import {
  companyWarnDaysSql,
  qualificationLapsesOnSql,
  qualificationStateSql,
} from '../continuity/continuity-state.repository.js';
import { WelderEntity } from './welder.entity.js';
import { preparedQuery } from '../lib/prepared.js';

type ListQuery = z.output<typeof welderListQuery>;
type WelderRaw = Omit<Welder, 'createdAt'> & { createdAt: Date };

const toWelder = (r: WelderRaw): Welder => ({ ...r, createdAt: r.createdAt.toISOString() });

/**
 * Today's continuity of the welder's qualifications, from the maintained state (issue 5). The company's
 * largest lead time is read inside the same statement (an uncorrelated subselect on company_settings,
 * evaluated once, with the default when the company has no settings row).
 */
export interface StatusAsOf {
  asOf: string;
}

// Hand-written SQL run as prepared statements (lib/prepared.ts): the list is the busiest read of the
// product, and building it with the QueryBuilder and planning it on every call cost more than running
// it. Parameters: $1 the company, $2 today; the rest are numbered as the filters add them.
const qState = qualificationStateSql('q', 'cs', '$2::date', companyWarnDaysSql('$1'));
const qLapses = qualificationLapsesOnSql('q', 'cs');
const qualificationsOf = `FROM qualifications q
  LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
  WHERE q.welder_id = w.id AND q.superseded_by_id IS NULL`;

const welderColumns = `w.id, w.stamp, w.name, json_build_object('id', s.id, 'name', s.name, 'code', s.code) AS "homeShop",
  w.email, w.active, EXISTS (SELECT 1 FROM users u WHERE u.welder_id = w.id) AS "hasAccount", w.version,
  w.created_at AS "createdAt",
  (SELECT coalesce(json_agg(json_build_object('id', q.id, 'process', q.process, 'code', q.code,
      'state', ${qState}, 'lapsesOn', to_char(${qLapses}, 'YYYY-MM-DD'), 'daysLeft', ${qLapses} - $2::date)
      ORDER BY q.process, q.code, q.certified_on), '[]') ${qualificationsOf}) AS qualifications`;

const sortColumn: Record<ListQuery['sort'], string> = {
  stamp: 'w.stamp',
  name: 'w.name',
  homeShop: 's.name',
  createdAt: 'w.created_at',
  // The soonest lapse still ahead (today or later): lapsed ones are shown apart, never first (issue 10
  // item 6). welders.soonest_lapses_on (maintained with the continuity states, migration 1764979200000) is
  // the soonest over every qualification in force; only a welder whose soonest is already past needs his
  // qualifications looked at for the soonest one ahead.
  lapsesOn: `CASE WHEN w.soonest_lapses_on >= $2::date THEN w.soonest_lapses_on
    ELSE (SELECT min(${qLapses}) ${qualificationsOf} AND ${qLapses} >= $2::date) END`,
};

/** The welders the actor may read (lib/scope's rule, in SQL): conditions and their parameters. */
function scoped(actor: Actor, status: StatusAsOf) {
  const params: unknown[] = [actor.organizationId, status.asOf];
  const where = ['w.organization_id = $1'];
  const param = (value: unknown) => `$${params.push(value)}`;
  if (actor.role === 'foreman') where.push(`w.home_shop_id = ANY(${param(actor.shopIds)}::uuid[])`);
  if (actor.role === 'welder') where.push(actor.welderId ? `w.id = ${param(actor.welderId)}` : 'false');
  return { params, where, param };
}

const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/** One page and the total, in one round trip (the total is an uncorrelated subselect, counted once). */
export async function listWelders(
  db: EntityManager,
  actor: Actor,
  query: ListQuery,
  status: StatusAsOf,
): Promise<{ items: Welder[]; total: number }> {
  const { params, where, param } = scoped(actor, status);
  if (query.state) where.push(`EXISTS (SELECT 1 ${qualificationsOf} AND ${qState} = ${param(query.state)})`);
  if (query.status !== 'all') where.push(`w.active = ${param(query.status === 'active')}`);
  if (query.shopId) where.push(`w.home_shop_id = ${param(query.shopId)}`);
  if (query.q) {
    const q = param(likePattern(query.q));
    where.push(`(w.stamp ILIKE ${q} OR w.name ILIKE ${q})`);
  }
  const from = `FROM welders w JOIN shops s ON s.id = w.home_shop_id WHERE ${where.join(' AND ')}`;
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const order = `${sortColumn[query.sort]} ${dir}${query.sort === 'lapsesOn' ? ' NULLS LAST' : ''}, w.stamp ${dir}, w.id`;
  const limit = param(query.pageSize);
  const offset = param((query.page - 1) * query.pageSize);
  // welders ⋈ shops is one row per welder: a plain count over the same filters.
  const rows = await preparedQuery<WelderRaw & { total: number }>(
    db,
    `SELECT ${welderColumns}, (SELECT count(*)::int ${from}) AS total ${from} ORDER BY ${order} LIMIT ${limit} OFFSET ${offset}`,
    params,
  );
  // A page past the end has no row to carry the total: count alone then.
  const total =
    rows[0]?.total ??
    (query.page === 1
      ? 0
      : ((
          await preparedQuery<{ total: number }>(
            db,
            // $2 (today) is named so that every parameter of the filters keeps its number and type.
            `SELECT count(*)::int AS total, $2::date AS "asOf" ${from}`,
            params.slice(0, -2),
          )
        )[0]?.total ?? 0));
  return { items: rows.map(({ total: _t, ...r }) => toWelder(r)), total };
}

export async function findWelder(
  db: EntityManager,
  actor: Actor,
  id: string,
  status: StatusAsOf,
): Promise<Welder | null> {
  const { params, where, param } = scoped(actor, status);
  where.push(`w.id = ${param(id)}`);
  const [row] = await preparedQuery<WelderRaw>(
    db,
    `SELECT ${welderColumns} FROM welders w JOIN shops s ON s.id = w.home_shop_id WHERE ${where.join(' AND ')}`,
    params,
  );
  return row ? toWelder(row) : null;
}

export interface WelderRow {
  id: string;
  stamp: string;
  name: string;
  homeShopId: string;
  email: string;
  active: boolean;
  version: number;
}

export async function lockWelder(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<WelderRow | null> {
  const rows: WelderRow[] = await db.query(
    `SELECT id, stamp, name, home_shop_id AS "homeShopId", email, active, version
       FROM welders WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

export async function findWelderByStamp(
  db: EntityManager,
  organizationId: string,
  stamp: string,
): Promise<{ id: string; name: string } | null> {
  const rows: { id: string; name: string }[] = await db.query(
    `SELECT id, name FROM welders WHERE organization_id = $1 AND stamp = $2`,
    [organizationId, stamp],
  );
  return rows[0] ?? null;
}

export async function insertWelder(
  db: EntityManager,
  w: { organizationId: string; stamp: string; name: string; homeShopId: string; email: string; at: Date },
): Promise<string> {
  const { at, ...fields } = w;
  const result = await db.insert(WelderEntity, {
    ...fields,
    active: true,
    version: 1,
    createdAt: at,
    updatedAt: at,
  });
  return (result.identifiers[0] as { id: string }).id;
}

/** Applies the patch and bumps the version, only if the row is still at `version`. Returns whether it did. */
export async function updateWelder(
  db: EntityManager,
  id: string,
  version: number,
  patch: Partial<Pick<WelderRow, 'stamp' | 'name' | 'homeShopId' | 'email' | 'active'>> & {
    leftAt?: Date | null;
  },
  at: Date,
): Promise<boolean> {
  const result = await db
    .createQueryBuilder()
    .update(WelderEntity)
    .set({ ...patch, version: () => 'version + 1', updatedAt: at })
    .where('id = :id AND version = :version', { id, version })
    .execute();
  return result.affected === 1;
}
