// Signing in, the caller's profile, and the single-use links that set a password (invitation and reset).
import { createHash, randomBytes } from 'node:crypto';
import { addDays, addHours } from 'date-fns';
import type { EntityManager } from 'typeorm';
import {
  setPasswordInput,
  type LoginInput,
  type Me,
  type SetPasswordInput,
  type TokenInfo,
} from '@beadroll/rules';
import { AppError } from '../lib/errors.js';
import type { AppDeps } from '../lib/context.js';
import type { Actor } from '../lib/scope.js';
import { recordAudit } from '../lib/audit.js';
import { signSession } from '../lib/auth.js';
import { listShopRefs } from '../shops/shops.service.js';
import * as repo from './auth.repository.js';
import type { TokenPurpose } from './auth-token.entity.js';
import { hashPassword, verifyPassword } from './passwords.js';
import { invitationMail, passwordResetMail } from './auth.mail.js';

const WRONG_SIGN_IN = 'E-mail or password is wrong';
const BAD_LINK = 'This link has expired or was already used';
const validity: Record<TokenPurpose, (from: Date) => Date> = {
  invitation: (from) => addDays(from, 7),
  'password-reset': (from) => addHours(from, 1),
};

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export async function getMe(deps: AppDeps, actor: Actor): Promise<Me> {
  const row = await repo.findMe(deps.dataSource.manager, actor.id);
  if (!row) throw new AppError('unauthenticated', 'Sign in to continue');
  return { ...row, shops: await listShopRefs(deps, actor) };
}

async function signIn(deps: AppDeps, userId: string): Promise<{ token: string; me: Me }> {
  const db = deps.dataSource.manager;
  await repo.recordSignIn(db, userId, deps.clock.now());
  const actor = await repo.loadActor(db, userId);
  if (!actor) throw new AppError('unauthenticated', WRONG_SIGN_IN);
  return { token: signSession(deps.config, actor), me: await getMe(deps, actor) };
}

export async function login(deps: AppDeps, input: LoginInput): Promise<{ token: string; me: Me }> {
  const user = await repo.findSignIn(deps.dataSource.manager, input.email);
  const ok = await verifyPassword(user?.passwordHash ?? null, input.password);
  if (!user || !ok || !user.active) throw new AppError('unauthenticated', WRONG_SIGN_IN);
  return signIn(deps, user.id);
}

/**
 * Creates a fresh single-use link for the user (voiding older ones of the same purpose) and e-mails it,
 * inside the caller's transaction: if the mail cannot be sent, nothing of the link is kept.
 */
export async function sendLink(
  deps: AppDeps,
  db: EntityManager,
  user: { id: string; email: string; name: string; organizationName: string },
  purpose: TokenPurpose,
): Promise<void> {
  const now = deps.clock.now();
  const token = randomBytes(32).toString('base64url');
  const expiresAt = validity[purpose](now);
  await repo.voidTokens(db, user.id, now, purpose);
  await repo.insertToken(db, {
    userId: user.id,
    tokenHash: hashToken(token),
    purpose,
    expiresAt,
    createdAt: now,
  });
  const link = `${deps.config.appUrl}/set-password?token=${encodeURIComponent(token)}`;
  const mail = { to: user.email, name: user.name, organizationName: user.organizationName, link, expiresAt };
  try {
    await deps.mailer.send(purpose === 'invitation' ? invitationMail(mail) : passwordResetMail(mail));
  } catch (err) {
    deps.logger.error({ err, to: user.email }, 'could not send e-mail');
    throw new AppError('unavailable', 'The e-mail could not be sent; nothing was saved. Try again shortly.');
  }
}

/** Always succeeds from the caller's point of view, so it does not reveal which e-mails have accounts. */
export async function requestPasswordReset(deps: AppDeps, email: string): Promise<void> {
  const user = await repo.findSignIn(deps.dataSource.manager, email);
  if (!user || !user.active) return;
  try {
    await deps.dataSource.transaction(async (db) => {
      const me = await repo.findMe(db, user.id);
      if (!me) return;
      await sendLink(
        deps,
        db,
        { id: me.id, email: me.email, name: me.name, organizationName: me.organization.name },
        'password-reset',
      );
    });
  } catch (err) {
    deps.logger.error({ err }, 'password reset e-mail failed');
  }
}

function parseToken(token: string): string {
  const parsed = setPasswordInput.shape.token.safeParse(token);
  if (!parsed.success) throw AppError.validation({ token: BAD_LINK }, BAD_LINK);
  return parsed.data;
}

export async function getTokenInfo(deps: AppDeps, token: string): Promise<TokenInfo> {
  const row = await repo.findValidToken(
    deps.dataSource.manager,
    hashToken(parseToken(token)),
    deps.clock.now(),
  );
  if (!row) throw AppError.validation({ token: BAD_LINK }, BAD_LINK);
  return { email: row.email, name: row.name, purpose: row.purpose, expiresAt: row.expiresAt.toISOString() };
}

/** Uses a link: sets the password, voids every open link of the account, and signs the person in. */
export async function setPassword(
  deps: AppDeps,
  input: SetPasswordInput,
): Promise<{ token: string; me: Me }> {
  const tokenHash = hashToken(input.token);
  const passwordHash = await hashPassword(input.password);
  const userId = await deps.dataSource.transaction(async (db) => {
    const now = deps.clock.now();
    const row = await repo.findValidToken(db, tokenHash, now, true);
    if (!row) throw AppError.validation({ token: BAD_LINK }, BAD_LINK);
    await repo.setPasswordHash(db, row.userId, passwordHash);
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
  });
  return signIn(deps, userId);
}
