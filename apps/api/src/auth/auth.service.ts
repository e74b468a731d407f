// Signing in, the caller's profile, and the single-use links that set a password (invitation and reset).
import { addHours } from 'date-fns';
import {
  setPasswordInput,
  type LoginInput,
  type Me,
  type SessionList,
  type SetPasswordInput,
  type TokenInfo,
} from '@beadroll/rules';
import { AppError } from '../lib/errors.js';
import { isUniqueViolation } from '../lib/db-errors.js';
import type { AppDeps } from '../lib/context.js';
import { isUuid, type Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { clipText } from '../lib/text.js';
import { SESSION_HOURS, signSession } from '../lib/auth.js';
import { listShopRefs } from '../shops/shops.service.js';
import { companyTimeZone, zoneInForce } from '../settings/settings.repository.js';
import { ipKeyGenerator } from 'express-rate-limit';
import * as repo from './auth.repository.js';
import * as throttle from './throttle.repository.js';
import { hashPassword, verifyPassword } from './passwords.js';
import { enqueueLinkMail, hashToken, sendDueLinkMails } from './link-mail.js';

const WRONG_SIGN_IN = 'E-mail or password is wrong';
const BAD_LINK = 'This link has expired or was already used';

export async function getMe(deps: AppDeps, actor: Actor): Promise<Me> {
  const row = await repo.findMe(deps.dataSource.manager, actor.id);
  if (!row) throw new AppError('unauthenticated', 'Sign in to continue');
  const timeZone = actor.timeZone !== undefined ? zoneInForce(actor.timeZone) : await companyTimeZone(deps.dataSource.manager, actor.organizationId);
  return { ...row, shops: await listShopRefs(deps, actor), timeZone };
}

/** Where a sign-in comes from, kept on its session so the owner can tell their devices apart. */
export interface ClientInfo {
  userAgent: string;
  address: string;
}

async function signIn(deps: AppDeps, userId: string, client: ClientInfo): Promise<{ token: string; me: Me }> {
  const now = deps.clock.now();
  const { actor, sessionId } = await deps.dataSource.transaction(async (db) => {
    await repo.recordSignIn(db, userId, now);
    const actor = await repo.loadActor(db, userId);
    if (!actor) throw new AppError('unauthenticated', WRONG_SIGN_IN);
    const sessionId = await repo.insertSession(db, {
      userId,
      at: now,
      expiresAt: addHours(now, SESSION_HOURS),
      userAgent: clip(client.userAgent, 300),
      address: clip(client.address, 64),
    });
    return { actor, sessionId };
  });
  return { token: signSession(deps.config, actor, sessionId), me: await getMe(deps, actor) };
}

/** Printable text only (a header can carry anything), at most max UTF-16 units. */
const clip = (s: string, max: number) =>
  clipText(s.replace(/[^\x20-\x7e\u00a0-\ud7ff\ue000-\uffff\u{10000}-\u{10ffff}]/gu, ''), max);

/** The account and the client address a sign-in is counted against (IPv6: its /56 network). */
function throttleKeys(deps: AppDeps, email: string, client: ClientInfo): throttle.ThrottleKey[] {
  return [
    { kind: 'account', key: email, limit: deps.config.loginRateLimit },
    { kind: 'address', key: ipKeyGenerator(client.address || 'unknown'), limit: deps.config.loginAddressLimit },
  ];
}

/**
 * Signing in. Refused passwords are counted per account and per client address in PostgreSQL (every
 * instance sees them); past a limit the key is held back with a growing wait, and the answer is 429
 * whatever the password. Only a refused password counts — a database outage fails before counting.
 * A held-back account is still reachable through a password reset link, which clears its count.
 */
export async function login(
  deps: AppDeps,
  input: LoginInput,
  client: ClientInfo,
): Promise<{ token: string; me: Me }> {
  const db = deps.dataSource.manager;
  const now = deps.clock.now();
  const keys = throttleKeys(deps, input.email, client);
  const until = await throttle.heldUntil(db, keys, now);
  if (until) {
    const seconds = Math.max(1, Math.ceil((until.getTime() - now.getTime()) / 1000));
    const wait = seconds > 90 ? `${Math.ceil(seconds / 60)} minutes` : `${seconds} seconds`;
    throw new AppError(
      'rate_limited',
      `Too many sign-in attempts; try again in ${wait}, or reset your password by e-mail`,
      429,
      undefined,
      seconds,
    );
  }
  const user = await repo.findSignIn(db, input.email);
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) {
    await throttle.recordFailure(db, keys, now);
    throw new AppError('unauthenticated', WRONG_SIGN_IN);
  }
  await throttle.clearAccount(db, input.email);
  return signIn(deps, user.id, client);
}

// ---- sessions -------------------------------------------------------------------------------------

/** Signing out: ends the session the cookie names (if any); the cookie is cleared by the caller. */
export async function signOut(deps: AppDeps, sessionId: string | null): Promise<void> {
  if (sessionId && isUuid(sessionId)) await repo.endSessionById(deps.dataSource.manager, sessionId, deps.clock.now());
}

export async function listSessions(deps: AppDeps, actor: Actor): Promise<SessionList> {
  const rows = await repo.listOpenSessions(deps.dataSource.manager, actor.id, deps.clock.now());
  return {
    items: rows.map((r) => ({
      id: r.id,
      createdAt: r.createdAt.toISOString(),
      lastSeenAt: r.lastSeenAt.toISOString(),
      expiresAt: r.expiresAt.toISOString(),
      userAgent: r.userAgent,
      address: r.address,
      current: r.id === actor.sessionId,
    })),
  };
}

/**
 * Ends one of the caller's own sessions (`id`), or every other one (`id` null). Another person's session
 * id matches nothing: 404. Recorded in the audit trail of the person.
 */
export async function endOwnSessions(deps: AppDeps, actor: Actor, id: string | null): Promise<{ ended: number }> {
  if (id !== null && !isUuid(id)) throw AppError.notFound('session');
  return deps.dataSource.transaction(async (db) => {
    const now = deps.clock.now();
    const ended = await repo.endSessions(
      db,
      actor.id,
      now,
      id === actor.sessionId ? 'signed-out' : 'ended-by-owner',
      id === null ? { except: actor.sessionId ?? null } : { only: id },
    );
    if (id !== null && ended.length === 0) throw AppError.notFound('session');
    if (ended.length > 0)
      await recordAudit(db, actor, now, {
        action: 'person.sessions_ended',
        entityType: 'person',
        entityId: actor.id,
        before: { openSessions: ended },
        after: { openSessions: [] },
      });
    return { ended: ended.length };
  });
}

/** Always succeeds from the caller's point of view, so it does not reveal which e-mails have accounts. */
export async function requestPasswordReset(deps: AppDeps, email: string): Promise<void> {
  const user = await repo.findSignIn(deps.dataSource.manager, email);
  if (!user || !user.active) return;
  // Through the link-mail outbox: a relay that does not answer now is retried by the schedule.
  await enqueueLinkMail(deps.dataSource.manager, {
    organizationId: user.organizationId,
    userId: user.id,
    purpose: 'password-reset',
    at: deps.clock.now(),
  });
  await sendDueLinkMails(deps, user.organizationId);
}

export async function getTokenInfo(deps: AppDeps, token: string): Promise<TokenInfo> {
  const parsed = setPasswordInput.shape.token.safeParse(token);
  const row = parsed.success
    ? await repo.findValidToken(deps.dataSource.manager, hashToken(parsed.data), deps.clock.now())
    : null;
  if (!row) return { usable: false, message: BAD_LINK };
  if (!row.hadPassword && (await repo.addressSignsInElsewhere(deps.dataSource.manager, row.userId, row.email)))
    return { usable: false, message: addressTaken().message };
  return {
    usable: true,
    email: row.email,
    name: row.name,
    purpose: row.purpose,
    expiresAt: row.expiresAt.toISOString(),
    timeZone: await companyTimeZone(deps.dataSource.manager, row.organizationId),
  };
}

/**
 * Told only to the holder of the link, i.e. the owner of the mailbox: an invitation to an address that
 * already signs in for another company cannot be taken up, and that account stays as it is.
 */
const addressTaken = () =>
  AppError.conflict(
    'This e-mail address already signs in to Beadroll for another company. One address holds one sign-in: ' +
      'ask whoever invited you to invite another address. Your existing sign-in is unchanged.',
  );

/** Uses a link: sets the password, voids every open link of the account, and signs the person in. */
export async function setPassword(
  deps: AppDeps,
  input: SetPasswordInput,
  client: ClientInfo,
): Promise<{ token: string; me: Me }> {
  const tokenHash = hashToken(input.token);
  const passwordHash = await hashPassword(input.password);
  const userId = await deps.dataSource.transaction(async (db) => {
    const now = deps.clock.now();
    const row = await repo.findValidToken(db, tokenHash, now, true);
    if (!row) throw AppError.validation({ token: BAD_LINK }, BAD_LINK);
    if (!row.hadPassword && (await repo.addressSignsInElsewhere(db, row.userId, row.email))) throw addressTaken();
    await repo.setPasswordHash(db, row.userId, passwordHash);
    await throttle.clearAccount(db, row.email);
    await repo.voidTokens(db, row.userId, now);
    const self: Actor = {
      id: row.userId,
      organizationId: row.organizationId,
      role: row.role,
      welderId: row.welderId,
      shopIds: [],
    };
    await recordAudit(db, self, now, {
      action: row.hadPassword ? 'person.password_reset' : 'person.activated',
      entityType: 'person',
      entityId: row.userId,
      before: { status: row.hadPassword ? 'active' : 'invited' },
      after: { status: 'active' },
    });
    return row.userId;
  }).catch((err: unknown) => {
    // Two invitations of one address taken up at the same moment: the unique index keeps one.
    if (isUniqueViolation(err, 'users_sign_in_email_key')) throw addressTaken();
    throw err;
  });
  // The new password ended every older session (trigger on users); this one starts fresh.
  return signIn(deps, userId, client);
}
