// Shops in PostgreSQL. Reads are scoped by lib/scope; plain objects out.
import type { EntityManager } from 'typeorm';
import type { Shop, ShopRef } from '@beadroll/rules';
import { scopeShops, type Actor } from '../lib/scope.js';
import { ShopEntity } from './shop.entity.js';

function shopsQuery(db: EntityManager, actor: Actor) {
  const qb = db
    .createQueryBuilder()
    .from(ShopEntity, 's')
    .select('s.id', 'id')
    .addSelect('s.name', 'name')
    .addSelect('s.code', 'code')
    .addSelect('s.location', 'location')
    .addSelect('s.active', 'active')
    .addSelect(
      '(SELECT count(*)::int FROM welders w WHERE w.home_shop_id = s.id AND w.active)',
      'welderCount',
    )
    .addSelect(
      `COALESCE((SELECT json_agg(json_build_object('id', u.id, 'name', u.name) ORDER BY u.name)
                   FROM foreman_shops fs JOIN users u ON u.id = fs.user_id
                  WHERE fs.shop_id = s.id AND u.active), '[]'::json)`,
      'foremen',
    );
  return scopeShops(qb, 's', actor);
}

export async function listShops(db: EntityManager, actor: Actor): Promise<Shop[]> {
  return shopsQuery(db, actor).orderBy('s.code').getRawMany<Shop>();
}

export async function findShop(db: EntityManager, actor: Actor, id: string): Promise<Shop | null> {
  return (await shopsQuery(db, actor).andWhere('s.id = :id', { id }).getRawOne<Shop>()) ?? null;
}

export async function listShopRefs(db: EntityManager, actor: Actor): Promise<ShopRef[]> {
  const qb = db
    .createQueryBuilder()
    .from(ShopEntity, 's')
    .select('s.id', 'id')
    .addSelect('s.name', 'name')
    .addSelect('s.code', 'code');
  return scopeShops(qb, 's', actor).orderBy('s.code').getRawMany<ShopRef>();
}

export interface ShopRow {
  id: string;
  name: string;
  code: string;
  location: string;
  active: boolean;
}

/** The shop row, locked for update, if it belongs to the organization. */
export async function lockShop(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<ShopRow | null> {
  const rows: ShopRow[] = await db.query(
    `SELECT id, name, code, location, active FROM shops WHERE organization_id = $1 AND id = $2 FOR UPDATE`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

export async function findShopByCode(
  db: EntityManager,
  organizationId: string,
  code: string,
): Promise<ShopRow | null> {
  const rows: ShopRow[] = await db.query(
    `SELECT id, name, code, location, active FROM shops WHERE organization_id = $1 AND code = $2`,
    [organizationId, code],
  );
  return rows[0] ?? null;
}

/** Of the given ids, those that are shops of the organization. */
export async function shopsOfOrganization(
  db: EntityManager,
  organizationId: string,
  ids: string[],
): Promise<ShopRef[]> {
  if (ids.length === 0) return [];
  return db.query(
    `SELECT id, name, code FROM shops WHERE organization_id = $1 AND id = ANY($2::uuid[]) ORDER BY code`,
    [organizationId, ids],
  );
}

export async function insertShop(
  db: EntityManager,
  shop: { organizationId: string; name: string; code: string; location: string; createdAt: Date },
): Promise<string> {
  const result = await db.insert(ShopEntity, { ...shop, active: true });
  return (result.identifiers[0] as { id: string }).id;
}

export async function updateShop(
  db: EntityManager,
  id: string,
  patch: Partial<Omit<ShopRow, 'id'>>,
): Promise<void> {
  if (Object.keys(patch).length > 0) await db.update(ShopEntity, { id }, patch);
}
