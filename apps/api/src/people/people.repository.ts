// Sign-ins of a company ("people") and foreman-to-shop assignments in PostgreSQL. Plain objects out.
import type { EntityManager } from 'typeorm';
import type { Person, Role } from '@beadroll/rules';
import { scopePeople, type Actor } from '../lib/scope.js';
import { UserEntity } from './user.entity.js';
import { ForemanShopEntity } from './foreman-shop.entity.js';

type PersonRaw = Omit<Person, 'lastSignInAt'> & { lastSignInAt: Date | null };

const toPerson = (r: PersonRaw): Person => ({
  ...r,
  lastSignInAt: r.lastSignInAt ? r.lastSignInAt.toISOString() : null,
});

function peopleQuery(db: EntityManager, actor: Actor) {
  const shopJson = `json_build_object('id', s.id, 'name', s.name, 'code', s.code) ORDER BY s.code`;
  const qb = db
    .createQueryBuilder()
    .from(UserEntity, 'u')
    .select('u.id', 'id')
    .addSelect('u.email', 'email')
    .addSelect('u.name', 'name')
    .addSelect('u.role', 'role')
    .addSelect('u.welder_id', 'welderId')
    .addSelect('u.last_sign_in_at', 'lastSignInAt')
    .addSelect(
      `CASE WHEN NOT u.active THEN 'deactivated' WHEN u.password_hash IS NULL THEN 'invited' ELSE 'active' END`,
      'status',
    )
    .addSelect(
      `CASE u.role
         WHEN 'foreman' THEN COALESCE((SELECT json_agg(${shopJson}) FROM foreman_shops fs JOIN shops s ON s.id = fs.shop_id WHERE fs.user_id = u.id), '[]'::json)
         WHEN 'welder' THEN COALESCE((SELECT json_agg(${shopJson}) FROM welders w JOIN shops s ON s.id = w.home_shop_id WHERE w.id = u.welder_id), '[]'::json)
         ELSE '[]'::json
       END`,
      'shops',
    );
  return scopePeople(qb, 'u', actor);
}

export async function listPeople(db: EntityManager, actor: Actor): Promise<Person[]> {
  const rows = await peopleQuery(db, actor).orderBy('u.name').addOrderBy('u.email').getRawMany<PersonRaw>();
  return rows.map(toPerson);
}

export async function findPerson(db: EntityManager, actor: Actor, id: string): Promise<Person | null> {
  const row = await peopleQuery(db, actor).andWhere('u.id = :id', { id }).getRawOne<PersonRaw>();
  return row ? toPerson(row) : null;
}

export interface PersonRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  hasPassword: boolean;
  welderId: string | null;
  shopIds: string[];
  organizationName: string;
}

/** The person's row, locked for update, if it belongs to the organization. */
export async function lockPerson(
  db: EntityManager,
  organizationId: string,
  id: string,
): Promise<PersonRow | null> {
  const rows: PersonRow[] = await db.query(
    `SELECT u.id, u.email, u.name, u.role, u.active, (u.password_hash IS NOT NULL) AS "hasPassword",
            u.welder_id AS "welderId", o.name AS "organizationName",
            ARRAY(SELECT fs.shop_id::text FROM foreman_shops fs WHERE fs.user_id = u.id ORDER BY 1) AS "shopIds"
       FROM users u JOIN organizations o ON o.id = u.organization_id
      WHERE u.organization_id = $1 AND u.id = $2
      FOR UPDATE OF u`,
    [organizationId, id],
  );
  return rows[0] ?? null;
}

/** Whether the address is already a person of this company (other companies' people are not asked about). */
export async function emailIsPerson(db: EntityManager, organizationId: string, email: string): Promise<boolean> {
  const rows: unknown[] = await db.query(`SELECT 1 FROM users WHERE organization_id = $1 AND email = $2`, [
    organizationId,
    email,
  ]);
  return rows.length > 0;
}

export interface WelderForAccount {
  id: string;
  name: string;
  email: string;
  hasAccount: boolean;
}

/** The welder record a welder sign-in would belong to, if it is the organization's. */
export async function findWelderForAccount(
  db: EntityManager,
  organizationId: string,
  welderId: string,
): Promise<WelderForAccount | null> {
  const rows: WelderForAccount[] = await db.query(
    `SELECT w.id, w.name, w.email, EXISTS (SELECT 1 FROM users u WHERE u.welder_id = w.id) AS "hasAccount"
       FROM welders w WHERE w.organization_id = $1 AND w.id = $2`,
    [organizationId, welderId],
  );
  return rows[0] ?? null;
}

export async function insertUser(
  db: EntityManager,
  user: {
    organizationId: string;
    email: string;
    name: string;
    role: Role;
    welderId: string | null;
    invitedAt: Date;
  },
): Promise<string> {
  const result = await db.insert(UserEntity, {
    ...user,
    passwordHash: null,
    active: true,
    createdAt: user.invitedAt,
  });
  return (result.identifiers[0] as { id: string }).id;
}

export async function updateUser(
  db: EntityManager,
  id: string,
  patch: Partial<{ name: string; active: boolean; invitedAt: Date }>,
): Promise<void> {
  if (Object.keys(patch).length > 0) await db.update(UserEntity, { id }, patch);
}

/** Replaces the foreman's shop assignments with exactly these shops. */
export async function setForemanShops(db: EntityManager, userId: string, shopIds: string[]): Promise<void> {
  await db.delete(ForemanShopEntity, { userId });
  if (shopIds.length > 0)
    await db.insert(
      ForemanShopEntity,
      shopIds.map((shopId) => ({ userId, shopId })),
    );
}
