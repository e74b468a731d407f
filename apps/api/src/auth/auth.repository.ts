// Sign-ins and link tokens in PostgreSQL. Plain objects out.
import type { EntityManager } from 'typeorm';
import type { Role } from '@beadroll/rules';
import type { Actor } from '../lib/scope.js';
import type { TokenPurpose } from './auth-token.entity.js';
import { AuthTokenEntity } from './auth-token.entity.js';
import { preparedQuery } from '../lib/prepared.js';

export interface SignInRow {
  id: string;
  organizationId: string;
  passwordHash: string | null;
  active: boolean;
}

/**
 * The account an e-mail signs in to: the one holding a password (at most one, by a unique index), else
 * the most recently invited active one (a reset link then activates it, like the invitation would).
 */
export async function findSignIn(db: EntityManager, email: string): Promise<SignInRow | null> {
  const rows: SignInRow[] = await db.query(
    `SELECT id, organization_id AS "organizationId", password_hash AS "passwordHash", active
       FROM users WHERE email = $1
      ORDER BY (password_hash IS NOT NULL) DESC, active DESC, invited_at DESC NULLS LAST
      LIMIT 1`,
    [email],
  );
  return rows[0] ?? null;
}

/** The caller as every request needs it, in one query: role, welder record and visible shop ids. */
export async function loadActor(db: EntityManager, userId: string): Promise<Actor | null> {
  const rows: Actor[] = await db.query(
    `SELECT u.id, u.organization_id AS "organizationId", u.role, u.welder_id AS "welderId",
            CASE u.role
              WHEN 'foreman' THEN ARRAY(SELECT fs.shop_id::text FROM foreman_shops fs WHERE fs.user_id = u.id ORDER BY 1)
              WHEN 'welder' THEN ARRAY(SELECT w.home_shop_id::text FROM welders w WHERE w.id = u.welder_id)
              ELSE ARRAY[]::text[]
            END AS "shopIds",
            (SELECT st.time_zone FROM company_settings st WHERE st.organization_id = u.organization_id) AS "timeZone"
       FROM users u
      WHERE u.id = $1 AND u.active AND u.password_hash IS NOT NULL`,
    [userId],
  );
  return rows[0] ?? null;
}

export interface MeRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  welderId: string | null;
  organization: { id: string; name: string };
}

export async function findMe(db: EntityManager, userId: string): Promise<MeRow | null> {
  const rows: MeRow[] = await db.query(
    `SELECT u.id, u.email, u.name, u.role, u.welder_id AS "welderId",
            json_build_object('id', o.id, 'name', o.name) AS organization
       FROM users u JOIN organizations o ON o.id = u.organization_id
      WHERE u.id = $1`,
    [userId],
  );
  return rows[0] ?? null;
}

/** Whether another account of the same address already holds a password (one sign-in per address). */
export async function addressSignsInElsewhere(db: EntityManager, userId: string, email: string): Promise<boolean> {
  const rows: unknown[] = await db.query(
    `SELECT 1 FROM users WHERE email = $1 AND id <> $2 AND password_hash IS NOT NULL`,
    [email, userId],
  );
  return rows.length > 0;
}

export async function recordSignIn(db: EntityManager, userId: string, at: Date): Promise<void> {
  await db.query(`UPDATE users SET last_sign_in_at = $2 WHERE id = $1`, [userId, at]);
}

export async function setPasswordHash(
  db: EntityManager,
  userId: string,
  passwordHash: string,
): Promise<void> {
  await db.query(`UPDATE users SET password_hash = $2 WHERE id = $1`, [userId, passwordHash]);
}

/** Voids every unused link of the user (of one purpose, or all), so only the newest link works. */
export async function voidTokens(
  db: EntityManager,
  userId: string,
  at: Date,
  purpose?: TokenPurpose,
): Promise<void> {
  await db.query(
    `UPDATE auth_tokens SET used_at = $2 WHERE user_id = $1 AND used_at IS NULL AND ($3::text IS NULL OR purpose = $3)`,
    [userId, at, purpose ?? null],
  );
}

export async function insertToken(
  db: EntityManager,
  token: { userId: string; tokenHash: string; purpose: TokenPurpose; expiresAt: Date; createdAt: Date },
): Promise<void> {
  await db.insert(AuthTokenEntity, token);
}

export interface ValidTokenRow {
  tokenId: string;
  purpose: TokenPurpose;
  expiresAt: Date;
  userId: string;
  organizationId: string;
  email: string;
  name: string;
  role: Role;
  welderId: string | null;
  hadPassword: boolean;
}

/** A token that is unused, unexpired at `now` and belongs to an active account; optionally row-locked. */
export async function findValidToken(
  db: EntityManager,
  tokenHash: string,
  now: Date,
  lock = false,
): Promise<ValidTokenRow | null> {
  const rows: ValidTokenRow[] = await db.query(
    `SELECT t.id AS "tokenId", t.purpose, t.expires_at AS "expiresAt", u.id AS "userId",
            u.organization_id AS "organizationId", u.email, u.name, u.role, u.welder_id AS "welderId",
            (u.password_hash IS NOT NULL) AS "hadPassword"
       FROM auth_tokens t JOIN users u ON u.id = t.user_id
      WHERE t.token_hash = $1 AND t.used_at IS NULL AND t.expires_at > $2 AND u.active
      ${lock ? 'FOR UPDATE OF t, u' : ''}`,
    [tokenHash, now],
  );
  return rows[0] ?? null;
}

// ---- sessions -------------------------------------------------------------------------------------

/** A session's last use is written at most every five minutes, so a busy session does not write per request. */
const TOUCH_AFTER_MS = 5 * 60 * 1000;

/**
 * The caller of an open session, in one read: the session row by primary key and its user. When the
 * last recorded use is older than five minutes, one UPDATE follows without holding up the request.
 */
export async function loadSessionActor(db: EntityManager, sessionId: string, now: Date): Promise<Actor | null> {
  // Every request runs this: a prepared statement, planned once per connection (lib/prepared.ts).
  const rows = await preparedQuery<Actor & { lastSeenAt: Date }>(
    db,
    `SELECT u.id, u.organization_id AS "organizationId", u.role, u.welder_id AS "welderId",
            CASE u.role
              WHEN 'foreman' THEN ARRAY(SELECT fs.shop_id::text FROM foreman_shops fs WHERE fs.user_id = u.id ORDER BY 1)
              WHEN 'welder' THEN ARRAY(SELECT w.home_shop_id::text FROM welders w WHERE w.id = u.welder_id)
              ELSE ARRAY[]::text[]
            END AS "shopIds",
            (SELECT st.time_zone FROM company_settings st WHERE st.organization_id = u.organization_id) AS "timeZone",
            s.id AS "sessionId", s.last_seen_at AS "lastSeenAt"
       FROM sessions s JOIN users u ON u.id = s.user_id
      WHERE s.id = $1 AND s.ended_at IS NULL AND s.expires_at > $2
        AND u.active AND u.password_hash IS NOT NULL`,
    [sessionId, now],
  );
  const row = rows[0];
  if (!row) return null;
  const { lastSeenAt, ...actor } = row;
  if (now.getTime() - lastSeenAt.getTime() > TOUCH_AFTER_MS)
    void db.query(`UPDATE sessions SET last_seen_at = $2 WHERE id = $1 AND last_seen_at < $2`, [sessionId, now]).catch(
      () => undefined, // a lost "last used" time is not worth failing or logging a request for
    );
  return actor;
}

export interface NewSession {
  userId: string;
  at: Date;
  expiresAt: Date;
  userAgent: string;
  address: string;
}

export async function insertSession(db: EntityManager, s: NewSession): Promise<string> {
  const rows: { id: string }[] = await db.query(
    `INSERT INTO sessions (user_id, created_at, last_seen_at, expires_at, user_agent, address)
     VALUES ($1, $2, $2, $3, $4, $5) RETURNING id`,
    [s.userId, s.at, s.expiresAt, s.userAgent, s.address],
  );
  return rows[0]!.id;
}

export type SessionEndReason = 'signed-out' | 'ended-by-owner';

/** Ends open sessions of the user: one (`only`), or every one but `except`. Returns the ids ended. */
export async function endSessions(
  db: EntityManager,
  userId: string,
  at: Date,
  reason: SessionEndReason,
  which: { only: string } | { except: string | null },
): Promise<string[]> {
  const rows: { id: string }[] = await db.query(
    // Wrapped in a SELECT: TypeORM answers a bare UPDATE … RETURNING with [rows, count].
    `WITH ended AS (
       UPDATE sessions SET ended_at = $2, ended_reason = $3
        WHERE user_id = $1 AND ended_at IS NULL
          AND ($4::uuid IS NULL OR id = $4) AND ($5::uuid IS NULL OR id <> $5)
        RETURNING id
     )
     SELECT id FROM ended`,
    [userId, at, reason, 'only' in which ? which.only : null, 'except' in which ? which.except : null],
  );
  return rows.map((r) => r.id);
}

/** Ends one session by id, whoever owns it (signing out with the session's own cookie). */
export async function endSessionById(db: EntityManager, sessionId: string, at: Date): Promise<void> {
  await db.query(
    `UPDATE sessions SET ended_at = $2, ended_reason = 'signed-out' WHERE id = $1 AND ended_at IS NULL`,
    [sessionId, at],
  );
}

export interface SessionRow {
  id: string;
  createdAt: Date;
  lastSeenAt: Date;
  expiresAt: Date;
  userAgent: string;
  address: string;
}

export async function listOpenSessions(db: EntityManager, userId: string, now: Date): Promise<SessionRow[]> {
  return db.query(
    `SELECT id, created_at AS "createdAt", last_seen_at AS "lastSeenAt", expires_at AS "expiresAt",
            user_agent AS "userAgent", address
       FROM sessions WHERE user_id = $1 AND ended_at IS NULL AND expires_at > $2
      ORDER BY last_seen_at DESC, id`,
    [userId, now],
  );
}
