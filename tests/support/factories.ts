// Rows for one test, written straight to PostgreSQL. Every call makes a fresh company (or rows inside a
// company the test made), so test files never depend on one another or on the demo seed.
import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import type { Role } from '@beadroll/rules';
import { hashPassword } from '../../apps/api/src/auth/passwords.js';

export const TEST_PASSWORD = 'factory-pass-2026';
let testHash: Promise<string> | undefined;
const passwordHash = () => (testHash ??= hashPassword(TEST_PASSWORD));

export const uniq = (prefix: string) => `${prefix}-${randomUUID().slice(0, 8)}`;
export const uniqueEmail = (prefix: string) => `${uniq(prefix)}@factory.example`;

export interface Company {
  id: string;
  name: string;
}
export interface ShopRow {
  id: string;
  code: string;
  name: string;
}
export interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
}
export interface WelderRow {
  id: string;
  stamp: string;
  name: string;
  homeShopId: string;
  email: string;
}

export async function makeCompany(ds: DataSource, name = uniq('Test Works')): Promise<Company> {
  const [row] = await ds.query<Company[]>(`INSERT INTO organizations (name) VALUES ($1) RETURNING id, name`, [
    name,
  ]);
  return row!;
}

export async function makeShop(
  ds: DataSource,
  org: Company,
  code: string,
  name = `${code} shop`,
): Promise<ShopRow> {
  const [row] = await ds.query<ShopRow[]>(
    `INSERT INTO shops (organization_id, code, name, location) VALUES ($1, $2, $3, '') RETURNING id, code, name`,
    [org.id, code, name],
  );
  return row!;
}

export async function makeWelder(
  ds: DataSource,
  org: Company,
  shop: ShopRow,
  w: { stamp: string; name?: string; email?: string; active?: boolean },
): Promise<WelderRow> {
  const [row] = await ds.query<WelderRow[]>(
    `INSERT INTO welders (organization_id, stamp, name, home_shop_id, email, active, left_at)
     VALUES ($1, $2, $3, $4, $5, $6, CASE WHEN $6 THEN NULL ELSE now() END)
     RETURNING id, stamp, name, home_shop_id AS "homeShopId", email`,
    [org.id, w.stamp, w.name ?? `Welder ${w.stamp}`, shop.id, w.email ?? '', w.active ?? true],
  );
  return row!;
}

/** A sign-in. `invited: true` leaves it without a password, as an open invitation does. */
export async function makeUser(
  ds: DataSource,
  org: Company,
  u: {
    role: Role;
    name?: string;
    email?: string;
    shops?: ShopRow[];
    welder?: WelderRow;
    active?: boolean;
    invited?: boolean;
  },
): Promise<UserRow> {
  const [row] = await ds.query<UserRow[]>(
    `INSERT INTO users (organization_id, email, name, role, password_hash, active, welder_id, invited_at)
     VALUES ($1, $2, $3, $4, $5, $6, $7, now()) RETURNING id, email, name, role`,
    [
      org.id,
      u.email ?? uniqueEmail(u.role),
      u.name ?? `Test ${u.role}`,
      u.role,
      u.invited ? null : await passwordHash(),
      u.active ?? true,
      u.welder?.id ?? null,
    ],
  );
  for (const shop of u.shops ?? [])
    await ds.query(`INSERT INTO foreman_shops (user_id, shop_id) VALUES ($1, $2)`, [row!.id, shop.id]);
  return row!;
}

/**
 * A company with two shops A and B; a QA manager; a foreman of shop A; a welder sign-in for welder A-01;
 * three welders in A (one has left) and two in B.
 */
export async function makeWorld(ds: DataSource) {
  const org = await makeCompany(ds);
  const shopA = await makeShop(ds, org, 'AA', 'Alpha Bay');
  const shopB = await makeShop(ds, org, 'BB', 'Beta Yard');
  const weldersA = [
    await makeWelder(ds, org, shopA, { stamp: 'A-01', name: 'Ada Quenby', email: uniqueEmail('a01') }),
    await makeWelder(ds, org, shopA, { stamp: 'A-02', name: 'Bo Ferrand' }),
    await makeWelder(ds, org, shopA, { stamp: 'A-03', name: 'Cy Lomax', active: false }),
  ];
  const weldersB = [
    await makeWelder(ds, org, shopB, { stamp: 'B-01', name: 'Di Harwick' }),
    await makeWelder(ds, org, shopB, { stamp: 'B-02', name: 'Ed Pellow' }),
  ];
  const qa = await makeUser(ds, org, { role: 'qa_manager', name: 'Quinn Assay' });
  const foreman = await makeUser(ds, org, { role: 'foreman', name: 'Fern Oakes', shops: [shopA] });
  const welder = await makeUser(ds, org, {
    role: 'welder',
    name: weldersA[0]!.name,
    email: weldersA[0]!.email,
    welder: weldersA[0],
  });
  return { org, shopA, shopB, weldersA, weldersB, qa, foreman, welder };
}

/** Another company with one shop, one welder and its own QA manager: for cross-company checks. */
export async function makeOtherCompany(ds: DataSource) {
  const org = await makeCompany(ds, uniq('Other Works'));
  const shop = await makeShop(ds, org, 'ZZ', 'Zeta Shop');
  const welder = await makeWelder(ds, org, shop, { stamp: 'Z-01', name: 'Zed Ormond' });
  const qa = await makeUser(ds, org, { role: 'qa_manager', name: 'Other QA' });
  return { org, shop, welder, qa };
}

export async function auditRows(ds: DataSource, entityId: string) {
  return await ds.query<
    { action: string; actorId: string | null; entityType: string; before: unknown; after: unknown }[]
  >(
    `SELECT action, actor_id AS "actorId", entity_type AS "entityType", before, after FROM audit_events WHERE entity_id = $1 ORDER BY at, id`,
    [entityId],
  );
}
