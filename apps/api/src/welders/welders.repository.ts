// Welders in PostgreSQL. The list is one set-based query plus one count, scoped by lib/scope.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { Welder, welderListQuery } from '@beadroll/rules';
import { scopeWelders, type Actor } from '../lib/scope.js';
import {
  companyWarnDaysSql,
  qualificationLapsesOnSql,
  qualificationStateSql,
} from '../continuity/continuity-state.repository.js';
import { WelderEntity } from './welder.entity.js';

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
const qState = qualificationStateSql('q', 'cs', ':asOf::date', companyWarnDaysSql(':organizationId'));
const qLapses = qualificationLapsesOnSql('q', 'cs');
const qualificationsOf = `FROM qualifications q
  LEFT JOIN continuity_states cs ON cs.welder_id = q.welder_id AND cs.process = q.process AND cs.code = q.code
  WHERE q.welder_id = w.id AND q.superseded_by_id IS NULL`;

const sortColumn: Record<ListQuery['sort'], string> = {
  stamp: 'w.stamp',
  name: 'w.name',
  homeShop: 's.name',
  createdAt: 'w.created_at',
  // Maintained with the continuity states (migration 1764979200000): soonest lapse among the welder's
  // qualifications in force — revoked ones cannot lapse.
  lapsesOn: 'w.soonest_lapses_on',
};

function weldersQuery(db: EntityManager, actor: Actor, status?: StatusAsOf) {
  const qb = db
    .createQueryBuilder()
    .from(WelderEntity, 'w')
    .innerJoin('Shop', 's', 's.id = w.home_shop_id')
    .select('w.id', 'id')
    .addSelect('w.stamp', 'stamp')
    .addSelect('w.name', 'name')
    .addSelect(`json_build_object('id', s.id, 'name', s.name, 'code', s.code)`, 'homeShop')
    .addSelect('w.email', 'email')
    .addSelect('w.active', 'active')
    .addSelect('EXISTS (SELECT 1 FROM users u WHERE u.welder_id = w.id)', 'hasAccount')
    .addSelect('w.version', 'version')
    .addSelect('w.created_at', 'createdAt');
  if (status)
    qb.addSelect(
      `(SELECT coalesce(json_agg(json_build_object('id', q.id, 'process', q.process, 'code', q.code,
          'state', ${qState}, 'lapsesOn', to_char(${qLapses}, 'YYYY-MM-DD'), 'daysLeft', ${qLapses} - :asOf::date)
          ORDER BY q.process, q.code, q.certified_on), '[]') ${qualificationsOf})`,
      'qualifications',
    ).setParameters({ asOf: status.asOf, organizationId: actor.organizationId });
  return scopeWelders(qb, 'w', actor);
}

const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listWelders(
  db: EntityManager,
  actor: Actor,
  query: ListQuery,
  status?: StatusAsOf,
): Promise<{ items: Welder[]; total: number }> {
  const qb = weldersQuery(db, actor, status);
  if (query.state && status) qb.andWhere(`EXISTS (SELECT 1 ${qualificationsOf} AND ${qState} = :state)`, { state: query.state });
  if (query.status !== 'all') qb.andWhere('w.active = :active', { active: query.status === 'active' });
  if (query.shopId) qb.andWhere('w.home_shop_id = :shopId', { shopId: query.shopId });
  if (query.q) qb.andWhere('(w.stamp ILIKE :q OR w.name ILIKE :q)', { q: likePattern(query.q) });
  // welders ⋈ shops is one row per welder: a plain count (no DISTINCT sort) over the same filters.
  const counted = await qb.clone().select('count(*)::int', 'total').orderBy().getRawOne<{ total: number }>();
  const total = counted?.total ?? 0;
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const rows = await qb
    .orderBy(sortColumn[query.sort], dir, query.sort === 'lapsesOn' ? 'NULLS LAST' : undefined)
    .addOrderBy('w.stamp', dir)
    .addOrderBy('w.id', 'ASC')
    .offset((query.page - 1) * query.pageSize)
    .limit(query.pageSize)
    .getRawMany<WelderRaw>();
  return { items: rows.map(toWelder), total };
}

export async function findWelder(
  db: EntityManager,
  actor: Actor,
  id: string,
  status?: StatusAsOf,
): Promise<Welder | null> {
  const row = await weldersQuery(db, actor, status).andWhere('w.id = :id', { id }).getRawOne<WelderRaw>();
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
