// Shops of a company: list (scoped by role), create and change (QA manager), each change audited.
import type { EntityManager } from 'typeorm';
import type { Shop, ShopInput, ShopRef, ShopUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import * as repo from './shops.repository.js';

export function listShopRefs(deps: AppDeps, actor: Actor): Promise<ShopRef[]> {
  return repo.listShopRefs(deps.dataSource.manager, actor);
}

/** Of the given ids, those that are shops of the actor's company (inside the caller's transaction). */
export function companyShops(db: EntityManager, actor: Actor, ids: string[]): Promise<ShopRef[]> {
  return repo.shopsOfOrganization(db, actor.organizationId, ids);
}

export async function listShops(deps: AppDeps, actor: Actor): Promise<{ items: Shop[] }> {
  return { items: await repo.listShops(deps.dataSource.manager, actor) };
}

export async function getShop(deps: AppDeps, actor: Actor, id: string): Promise<Shop> {
  const shop = isUuid(id) ? await repo.findShop(deps.dataSource.manager, actor, id) : null;
  if (!shop) throw AppError.notFound('shop');
  return shop;
}

const codeTaken = (code: string, by: string) =>
  AppError.validation({ code: `Code ${code} is already used by ${by}` });

export async function createShop(
  deps: AppDeps,
  actor: Actor,
  input: ShopInput & { location: string },
): Promise<Shop> {
  const id = await deps.dataSource
    .transaction(async (db) => {
      const taken = await repo.findShopByCode(db, actor.organizationId, input.code);
      if (taken) throw codeTaken(input.code, taken.name);
      const now = deps.clock.now();
      const shopId = await repo.insertShop(db, {
        organizationId: actor.organizationId,
        name: input.name,
        code: input.code,
        location: input.location,
        createdAt: now,
      });
      await recordAudit(db, actor, now, {
        action: 'shop.created',
        entityType: 'shop',
        entityId: shopId,
        before: null,
        after: { name: input.name, code: input.code, location: input.location, active: true },
      });
      return shopId;
    })
    .catch((err: unknown) => {
      // Two managers creating the same code at once: the unique index decides.
      if (isUniqueViolation(err, 'shops_organization_code_key')) throw codeTaken(input.code, 'another shop');
      throw err;
    });
  return getShop(deps, actor, id);
}

export async function updateShop(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: ShopUpdateInput,
): Promise<Shop> {
  if (!isUuid(id)) throw AppError.notFound('shop');
  await deps.dataSource
    .transaction(async (db) => {
      const current = await repo.lockShop(db, actor.organizationId, id);
      if (!current) throw AppError.notFound('shop');
      if (input.code !== undefined && input.code !== current.code) {
        const taken = await repo.findShopByCode(db, actor.organizationId, input.code);
        if (taken) throw codeTaken(input.code, taken.name);
      }
      const { id: _id, ...before } = current;
      const after = { ...before, ...input };
      const changes = diff(before, after);
      if (changes.changed.length === 0) return;
      await repo.updateShop(db, id, changes.after);
      await recordAudit(db, actor, deps.clock.now(), {
        action: 'shop.updated',
        entityType: 'shop',
        entityId: id,
        before: changes.before,
        after: changes.after,
      });
    })
    .catch((err: unknown) => {
      if (isUniqueViolation(err, 'shops_organization_code_key'))
        throw codeTaken(input.code ?? '', 'another shop');
      throw err;
    });
  return getShop(deps, actor, id);
}
