// Authorization of reads in one place: every query that lists or fetches shops, people or welders goes
// through these, so the organization from the session and the caller's role always narrow the rows.
// Another company's ids simply match nothing, which the services turn into 404.
import type { ObjectLiteral, SelectQueryBuilder } from 'typeorm';
import type { Role } from '@beadroll/rules';

/** The signed-in caller, loaded fresh from the database on every request. */
export interface Actor {
  id: string;
  organizationId: string;
  role: Role;
  /** The welder record of a welder account; null for other roles. */
  welderId: string | null;
  /** Foreman: assigned shops. Welder: the home shop. QA manager: empty (sees every shop of the company). */
  shopIds: string[];
  /**
   * The company's chosen time zone, loaded with the session (null: the server's zone; absent: not
   * loaded, read it from the settings).
   */
  timeZone?: string | null;
  /** Set when the caller is another system presenting an API token (issue 13); absent for a person. */
  apiToken?: { id: string; access: 'read' | 'read-write' };
  /** The session the request came with (absent for callers that are not a browser session). */
  sessionId?: string;
}

/** Shops the actor may read. `alias` is the shops alias in qb. */
export function scopeShops<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>, alias: string, actor: Actor) {
  qb.andWhere(`${alias}.organization_id = :scopeOrg`, { scopeOrg: actor.organizationId });
  if (actor.role !== 'qa_manager')
    qb.andWhere(`${alias}.id = ANY(:scopeShopIds)`, { scopeShopIds: actor.shopIds });
  return qb;
}

/** Welders the actor may read. `alias` is the welders alias in qb. */
export function scopeWelders<T extends ObjectLiteral>(
  qb: SelectQueryBuilder<T>,
  alias: string,
  actor: Actor,
) {
  qb.andWhere(`${alias}.organization_id = :scopeOrg`, { scopeOrg: actor.organizationId });
  if (actor.role === 'foreman')
    qb.andWhere(`${alias}.home_shop_id = ANY(:scopeShopIds)`, { scopeShopIds: actor.shopIds });
  if (actor.role === 'welder') {
    if (actor.welderId) qb.andWhere(`${alias}.id = :scopeWelderId`, { scopeWelderId: actor.welderId });
    else qb.andWhere('false');
  }
  return qb;
}

/** People the actor may read: only QA managers list people, always within their company. */
export function scopePeople<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>, alias: string, actor: Actor) {
  qb.andWhere(`${alias}.organization_id = :scopeOrg`, { scopeOrg: actor.organizationId });
  if (actor.role !== 'qa_manager') qb.andWhere(`${alias}.id = :scopeSelf`, { scopeSelf: actor.id });
  return qb;
}

/** Anything that is not a UUID cannot name a row: treat it as not found rather than as bad input. */
export function isUuid(s: string): boolean {
  return /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(s);
}
