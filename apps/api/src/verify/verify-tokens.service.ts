// Verify tokens: 32 random bytes (base64url) per welder, the one that a card's QR code carries. The
// database keeps a SHA-256 hash for the lookup and an AES-256-GCM sealed copy (key derived from the
// server secret) so a reprinted card keeps the same link. Issuing a new one ends the old one.
import { createCipheriv, createDecipheriv, createHash, hkdfSync, randomBytes } from 'node:crypto';
import type { EntityManager } from 'typeorm';
import type { AppDeps } from '../lib/context.js';
import { AppError } from '../lib/errors.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { VerifyTokenEntity } from './verify-token.entity.js';
import { preparedQuery } from '../lib/prepared.js';
import { displayName } from '@beadroll/rules';

export const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');

const keyCache = new Map<string, Buffer>();
function sealingKey(secret: string): Buffer {
  let key = keyCache.get(secret);
  if (!key) {
    key = Buffer.from(hkdfSync('sha256', secret, 'beadroll', 'verify-token-seal', 32));
    keyCache.set(secret, key);
  }
  return key;
}

export function sealToken(secret: string, token: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv('aes-256-gcm', sealingKey(secret), iv);
  const body = Buffer.concat([cipher.update(token, 'utf8'), cipher.final()]);
  return Buffer.concat([iv, cipher.getAuthTag(), body]).toString('base64url');
}

export function unsealToken(secret: string, sealed: string): string {
  const raw = Buffer.from(sealed, 'base64url');
  const decipher = createDecipheriv('aes-256-gcm', sealingKey(secret), raw.subarray(0, 12));
  decipher.setAuthTag(raw.subarray(12, 28));
  return Buffer.concat([decipher.update(raw.subarray(28)), decipher.final()]).toString('utf8');
}

export const verifyUrl = (appUrl: string, token: string) => `${appUrl}/verify/${token}`;

async function welderInCompany(db: EntityManager, actor: Actor, welderId: string): Promise<void> {
  const rows: unknown[] = isUuid(welderId)
    ? await db.query(`SELECT 1 FROM welders WHERE organization_id = $1 AND id = $2`, [
        actor.organizationId,
        welderId,
      ])
    : [];
  if (rows.length === 0) throw AppError.notFound('welder');
}

async function activeToken(db: EntityManager, welderId: string, lock = false) {
  const rows: { id: string; tokenSealed: string; issuedAt: Date }[] = await db.query(
    `SELECT id, token_sealed AS "tokenSealed", issued_at AS "issuedAt" FROM verify_tokens
      WHERE welder_id = $1 AND revoked_at IS NULL${lock ? ' FOR UPDATE' : ''}`,
    [welderId],
  );
  return rows[0] ?? null;
}

async function issueIn(deps: AppDeps, db: EntityManager, actor: Actor, welderId: string): Promise<string> {
  const [welder] = await db.query<{ name: string; active: boolean }[]>(
    `SELECT name, active FROM welders WHERE id = $1`,
    [welderId],
  );
  // No card and no verify link vouch for someone who has left.
  if (welder && !welder.active)
    throw AppError.conflict(`${welder.name} is no longer with the company; no card or verify link is issued`);
  const now = deps.clock.now();
  const previous = await activeToken(db, welderId, true);
  if (previous) await db.query(`UPDATE verify_tokens SET revoked_at = $2 WHERE id = $1`, [previous.id, now]);
  const token = randomBytes(32).toString('base64url');
  await db.insert(VerifyTokenEntity, {
    organizationId: actor.organizationId,
    welderId,
    tokenHash: hashToken(token),
    tokenSealed: sealToken(deps.config.jwtSecret, token),
    issuedAt: now,
    issuedBy: actor.id,
    revokedAt: null,
  });
  await recordAudit(db, actor, now, {
    action: previous ? 'verify-token.reissued' : 'verify-token.issued',
    entityType: 'verify-token',
    entityId: welderId,
    before: previous ? { active: true, issuedAt: previous.issuedAt.toISOString() } : { active: false },
    after: { active: true, issuedAt: now.toISOString() },
  });
  return verifyUrl(deps.config.appUrl, token);
}

/** POST /api/welders/:id/verify-token: a new token; the old link stops working. */
export async function issueVerifyToken(
  deps: AppDeps,
  actor: Actor,
  welderId: string,
): Promise<{ url: string }> {
  return deps.dataSource.transaction(async (db) => {
    await welderInCompany(db, actor, welderId);
    await db.query(`SELECT id FROM welders WHERE id = $1 FOR UPDATE`, [welderId]);
    return { url: await issueIn(deps, db, actor, welderId) };
  });
}

/**
 * The welder's live verify URL, or null when none is issued. A read: downloading a card or a WPQ never
 * creates a token (that would silently replace what the panel shows and kill printed cards later); a
 * token is issued only through POST /api/welders/:id/verify-token. The caller has already checked that
 * the actor may see the welder.
 */
export async function currentVerifyUrl(deps: AppDeps, welderId: string): Promise<string | null> {
  const existing = await activeToken(deps.dataSource.manager, welderId);
  return existing ? urlOfSealed(deps, welderId, existing.tokenSealed) : null;
}

function urlOfSealed(deps: AppDeps, welderId: string, sealed: string): string | null {
  try {
    return verifyUrl(deps.config.appUrl, unsealToken(deps.config.jwtSecret, sealed));
  } catch (err) {
    // Sealed under another server secret (a data folder moved between secrets): print without a link.
    deps.logger.warn({ err, welderId }, 'verify token cannot be unsealed with this server secret');
    return null;
  }
}

/**
 * The welder's verify URL, issuing a token if there is none yet. Only for the demo seed, which prints
 * nothing and acts as the QA manager would.
 */
export async function ensureVerifyUrl(deps: AppDeps, actor: Actor, welderId: string): Promise<string> {
  const existing = await currentVerifyUrl(deps, welderId);
  if (existing) return existing;
  return deps.dataSource.transaction(async (db) => {
    // Two downloads at once: the welder row lock makes the second one find the first one's token.
    await db.query(`SELECT id FROM welders WHERE id = $1 FOR UPDATE`, [welderId]);
    const again = await activeToken(db, welderId);
    const url = again ? urlOfSealed(deps, welderId, again.tokenSealed) : null;
    return url ?? issueIn(deps, db, actor, welderId);
  });
}

/** DELETE /api/welders/:id/verify-token: the card's link stops working. */
export async function revokeVerifyToken(deps: AppDeps, actor: Actor, welderId: string): Promise<void> {
  await deps.dataSource.transaction(async (db) => {
    await welderInCompany(db, actor, welderId);
    const current = await activeToken(db, welderId, true);
    if (!current) return;
    const now = deps.clock.now();
    await db.query(`UPDATE verify_tokens SET revoked_at = $2 WHERE id = $1`, [current.id, now]);
    await recordAudit(db, actor, now, {
      action: 'verify-token.revoked',
      entityType: 'verify-token',
      entityId: welderId,
      before: { active: true, issuedAt: current.issuedAt.toISOString() },
      after: { active: false },
    });
  });
}

/**
 * GET /api/welders/:id/verify-token: the panel's whole state. The live link itself (sealed, so it can be
 * shown again) and the documents that print it: the wallet card and every WPQ record of the welder carry
 * the QR code or the link, so reissuing or revoking kills each copy of them printed since `issuedAt`.
 */
export async function verifyTokenStatus(
  deps: AppDeps,
  actor: Actor,
  welderId: string,
): Promise<{ active: boolean; issuedAt: string | null; url: string | null; printedOn: string[] }> {
  const db = deps.dataSource.manager;
  await welderInCompany(db, actor, welderId);
  const current = await activeToken(db, welderId);
  if (!current) return { active: false, issuedAt: null, url: null, printedOn: [] };
  const wpqs = await db.query<{ number: string | null; code: string; process: string }[]>(
    `SELECT number, code, process FROM qualifications
      WHERE organization_id = $1 AND welder_id = $2 ORDER BY certified_on, created_at`,
    [actor.organizationId, welderId],
  );
  const printedOn = [
    'the wallet card',
    ...wpqs.map(
      (q) => `the WPQ record${q.number ? ` ${q.number}` : ''} (${displayName('codes', q.code)} ${q.process})`,
    ),
  ];
  return {
    active: true,
    issuedAt: current.issuedAt.toISOString(),
    url: urlOfSealed(deps, welderId, current.tokenSealed),
    printedOn,
  };
}

/**
 * The welder and company a live token names, or null. With `evenIfLeft`, also a token revoked when its
 * welder left (revoked at or after the welder's leaving), so the verify page can say so instead of
 * "no longer valid"; `live` tells the two apart.
 */
export async function resolveVerifyToken(
  db: EntityManager,
  token: string,
  opts: { evenIfLeft?: boolean } = {},
): Promise<{ welderId: string; organizationId: string; live: boolean } | null> {
  if (!/^[A-Za-z0-9_-]{43}$/.test(token)) return null;
  // The public verify page reads this on every scan: a prepared statement (lib/prepared.ts).
  const rows = await preparedQuery<{ welderId: string; organizationId: string; live: boolean }>(
    db,
    `SELECT t.welder_id AS "welderId", t.organization_id AS "organizationId", t.revoked_at IS NULL AS live
       FROM verify_tokens t JOIN welders w ON w.id = t.welder_id
      WHERE t.token_hash = $1
        AND (t.revoked_at IS NULL
             OR ($2 AND NOT w.active AND w.left_at IS NOT NULL AND t.revoked_at >= w.left_at))`,
    [hashToken(token), opts.evenIfLeft ?? false],
  );
  return rows[0] ?? null;
}

/** A welder who leaves the company takes no live card with them: their token is revoked (in the caller's transaction). */
export async function revokeTokenOnLeaving(db: EntityManager, welderId: string, at: Date): Promise<boolean> {
  const [row] = await db.query<{ n: number }[]>(
    `WITH u AS (UPDATE verify_tokens SET revoked_at = $2 WHERE welder_id = $1 AND revoked_at IS NULL RETURNING id)
     SELECT count(*)::int AS n FROM u`,
    [welderId, at],
  );
  return (row?.n ?? 0) > 0;
}
