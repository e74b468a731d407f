// API tokens: a QA manager creates one for another system, sees the secret once, and can revoke it.
// A token acts for the company with the reach its scope gives it:
// - every shop: a QA manager's reach; a subset of shops: a foreman's reach in those shops, so every
//   existing per-shop rule of the registry applies to it unchanged;
// - read: GET only; read-write: the writes that reach allows.
// Tokens are accepted only as `Authorization: Bearer`, never from a cookie, and never manage tokens.
import { createHash, randomBytes } from 'node:crypto';
import type { ApiToken, ApiTokenCreated, ApiTokenInput } from '@beadroll/rules';
import type { z } from 'zod';
import type { apiTokenInput } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { recordAudit } from '../lib/audit.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { companyShops } from '../shops/shops.service.js';
import * as repo from './api-tokens.repository.js';

export type { ApiTokenInput };
type Input = z.output<typeof apiTokenInput>;

const TOKEN_PREFIX = 'brt_';

export const hashToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

/** A new secret: 256 random bits, base64url, with a recognisable prefix (secret scanners can spot it). */
function newSecret(): string {
  return TOKEN_PREFIX + randomBytes(32).toString('base64url');
}

export async function listTokens(deps: AppDeps, actor: Actor): Promise<{ items: ApiToken[] }> {
  return { items: await repo.listTokens(deps.dataSource.manager, actor.organizationId) };
}

export async function createToken(deps: AppDeps, actor: Actor, input: Input): Promise<ApiTokenCreated> {
  const token = newSecret();
  const id = await deps.dataSource.transaction(async (db) => {
    const shopIds = [...new Set(input.shopIds)];
    const found = await companyShops(db, actor, shopIds);
    if (found.length !== shopIds.length) throw AppError.validation({ shopIds: 'Choose shops of your company' });
    const at = deps.clock.now();
    const tokenId = await repo.insertToken(db, {
      organizationId: actor.organizationId,
      name: input.name,
      access: input.access,
      shopIds,
      prefix: token.slice(0, TOKEN_PREFIX.length + 6),
      hash: hashToken(token),
      createdBy: actor.id,
      at,
    });
    await recordAudit(db, actor, at, {
      action: 'api-token.created',
      entityType: 'api-token',
      entityId: tokenId,
      before: null,
      after: { name: input.name, access: input.access, shopIds },
    });
    return tokenId;
  });
  const apiToken = await repo.findToken(deps.dataSource.manager, actor.organizationId, id);
  return { token, apiToken: apiToken! };
}

export async function revokeToken(deps: AppDeps, actor: Actor, id: string): Promise<ApiToken> {
  if (!isUuid(id)) throw AppError.notFound('API token');
  await deps.dataSource.transaction(async (db) => {
    const at = deps.clock.now();
    const revoked = await repo.revokeToken(db, actor.organizationId, id, actor.id, at);
    if (!revoked) {
      const exists = await repo.findToken(db, actor.organizationId, id);
      if (!exists) throw AppError.notFound('API token');
      return; // already revoked: nothing changes, nothing to audit
    }
    await recordAudit(db, actor, at, {
      action: 'api-token.revoked',
      entityType: 'api-token',
      entityId: id,
      before: { revokedAt: null },
      after: { revokedAt: at.toISOString() },
    });
  });
  return (await repo.findToken(deps.dataSource.manager, actor.organizationId, id))!;
}

/** The actor a presented token stands for, or null when it is unknown, revoked or its creator left. */
export async function actorOfToken(deps: AppDeps, token: string): Promise<Actor | null> {
  if (!token.startsWith(TOKEN_PREFIX) || token.length > 100) return null;
  const holder = await repo.useToken(deps.dataSource.manager, hashToken(token), deps.clock.now());
  if (!holder) return null;
  const limited = holder.shopIds.length > 0;
  return {
    id: holder.userId,
    organizationId: holder.organizationId,
    role: limited ? 'foreman' : 'qa_manager',
    welderId: null,
    shopIds: limited ? holder.shopIds : [],
    apiToken: { id: holder.tokenId, access: holder.access },
  };
}
