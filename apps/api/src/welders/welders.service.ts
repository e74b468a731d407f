// Welders of a company: the scoped, paged list; the welder file; adding and editing (QA manager) with
// optimistic locking on `version`. A change of home shop is audited as "welder.moved".
import type { z } from 'zod';
import type { Welder, WelderPage, welderInput, welderListQuery, WelderUpdateInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { diff, recordAudit } from '../lib/audit.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import { companyShops } from '../shops/shops.service.js';
import * as repo from './welders.repository.js';
import { companyToday } from '../settings/settings.repository.js';
import { revokeTokenOnLeaving } from '../verify/verify-tokens.service.js';
import type { EntityManager } from 'typeorm';

type WelderInput = z.output<typeof welderInput>;
type ListQuery = z.output<typeof welderListQuery>;

const stampTaken = (stamp: string, by: string) =>
  AppError.validation({ stamp: `Stamp ${stamp} is already used by ${by}` });

/** Today: what each qualification's state in a list is decided by (with the company's lead time, read in the query). */
async function statusAsOf(deps: AppDeps, actor: Actor): Promise<repo.StatusAsOf> {
  return { asOf: await companyToday(deps.dataSource.manager, actor, deps.clock) };
}

export async function listWelders(deps: AppDeps, actor: Actor, query: ListQuery): Promise<WelderPage> {
  const { items, total } = await repo.listWelders(deps.dataSource.manager, actor, query, await statusAsOf(deps, actor));
  return { items, total, page: query.page, pageSize: query.pageSize };
}

export async function getWelder(deps: AppDeps, actor: Actor, id: string): Promise<Welder> {
  const welder = isUuid(id) ? await repo.findWelder(deps.dataSource.manager, actor, id, await statusAsOf(deps, actor)) : null;
  if (!welder) throw AppError.notFound('welder');
  return welder;
}

async function checkHomeShop(db: EntityManager, actor: Actor, shopId: string): Promise<void> {
  const [shop] = await companyShops(db, actor, [shopId]);
  if (!shop) throw AppError.validation({ homeShopId: 'Choose a shop of your company' });
}

async function checkStampFree(db: EntityManager, actor: Actor, stamp: string): Promise<void> {
  const taken = await repo.findWelderByStamp(db, actor.organizationId, stamp);
  if (taken) throw stampTaken(stamp, taken.name);
}

function onUniqueStamp(stamp: string | undefined) {
  return (err: unknown): never => {
    // Two editors claiming one stamp at the same moment: the unique index decides.
    if (isUniqueViolation(err, 'welders_organization_stamp_key'))
      throw stampTaken(stamp ?? '', 'another welder');
    throw err;
  };
}

export async function createWelder(deps: AppDeps, actor: Actor, input: WelderInput): Promise<Welder> {
  const id = await deps.dataSource
    .transaction(async (db) => {
      await checkHomeShop(db, actor, input.homeShopId);
      await checkStampFree(db, actor, input.stamp);
      const now = deps.clock.now();
      const welderId = await repo.insertWelder(db, {
        organizationId: actor.organizationId,
        ...input,
        at: now,
      });
      await recordAudit(db, actor, now, {
        action: 'welder.created',
        entityType: 'welder',
        entityId: welderId,
        before: null,
        after: {
          stamp: input.stamp,
          name: input.name,
          homeShopId: input.homeShopId,
          email: input.email,
          active: true,
        },
      });
      return welderId;
    })
    .catch(onUniqueStamp(input.stamp));
  return getWelder(deps, actor, id);
}

const STALE =
  'Someone else changed this welder since you opened it; reload to see their change and try again';

export async function updateWelder(
  deps: AppDeps,
  actor: Actor,
  id: string,
  input: WelderUpdateInput,
): Promise<Welder> {
  if (!isUuid(id)) throw AppError.notFound('welder');
  await deps.dataSource
    .transaction(async (db) => {
      const current = await repo.lockWelder(db, actor.organizationId, id);
      if (!current) throw AppError.notFound('welder');
      if (current.version !== input.version) throw AppError.conflict(STALE);
      const { version: _v, id: _id, ...before } = current;
      const { version: _iv, ...patch } = input;
      const after = { ...before, ...patch };
      const changes = diff(before, after);
      if (changes.changed.length === 0) return;
      if (changes.changed.includes('stamp')) await checkStampFree(db, actor, after.stamp);
      if (changes.changed.includes('homeShopId')) await checkHomeShop(db, actor, after.homeShopId);
      const now = deps.clock.now();
      const leftAt = changes.changed.includes('active') ? { leftAt: after.active ? null : now } : {};
      const applied = await repo.updateWelder(db, id, current.version, { ...changes.after, ...leftAt }, now);
      if (!applied) throw AppError.conflict(STALE);
      // A welder who leaves takes no live card along: the verify link now says "no longer with the company".
      if (changes.changed.includes('active') && !after.active) await revokeTokenOnLeaving(db, id, now);
      await recordAudit(db, actor, now, {
        action: changes.changed.includes('homeShopId') ? 'welder.moved' : 'welder.updated',
        entityType: 'welder',
        entityId: id,
        before: changes.before,
        after: changes.after,
      });
    })
    .catch(onUniqueStamp(input.stamp));
  return getWelder(deps, actor, id);
}
