// Welders in PostgreSQL. The list is one set-based query plus one count, scoped by lib/scope.
import type { EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { Welder, welderListQuery } from '@beadroll/rules';
import { scopeWelders, type Actor } from '../lib/scope.js';
import { WelderEntity } from './welder.entity.js';

type ListQuery = z.output<typeof welderListQuery>;
type WelderRaw = Omit<Welder, 'createdAt'> & { createdAt: Date };

const toWelder = (r: WelderRaw): Welder => ({ ...r, createdAt: r.createdAt.toISOString() });

const sortColumn: Record<ListQuery['sort'], string> = {
  stamp: 'w.stamp',
  name: 'w.name',
  homeShop: 's.name',
  createdAt: 'w.created_at',
};

function weldersQuery(db: EntityManager, actor: Actor) {
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
  return scopeWelders(qb, 'w', actor);
}

const likePattern = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

export async function listWelders(
  db: EntityManager,
  actor: Actor,
  query: ListQuery,
): Promise<{ items: Welder[]; total: number }> {
  const qb = weldersQuery(db, actor);
  if (query.status !== 'all') qb.andWhere('w.active = :active', { active: query.status === 'active' });
  if (query.shopId) qb.andWhere('w.home_shop_id = :shopId', { shopId: query.shopId });
  if (query.q) qb.andWhere('(w.stamp ILIKE :q OR w.name ILIKE :q)', { q: likePattern(query.q) });
  const total = await qb.clone().getCount();
  const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
  const rows = await qb
    .orderBy(sortColumn[query.sort], dir)
    .addOrderBy('w.stamp', dir)
    .addOrderBy('w.id', 'ASC')
    .offset((query.page - 1) * query.pageSize)
    .limit(query.pageSize)
    .getRawMany<WelderRaw>();
  return { items: rows.map(toWelder), total };
}

export async function findWelder(db: EntityManager, actor: Actor, id: string): Promise<Welder | null> {
  const row = await weldersQuery(db, actor).andWhere('w.id = :id', { id }).getRawOne<WelderRaw>();
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
