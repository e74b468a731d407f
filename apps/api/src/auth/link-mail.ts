// The outbox of link e-mails (invitation, password reset; issue 11, finding 7). A request only writes a
// `link_mails` row in its own transaction and answers; `sendDueLinkMails` runs after the response (and
// every minute from the schedule, for retries): it claims a due row with a short lease (FOR UPDATE SKIP
// LOCKED, so several instances never send one row twice at once), makes the single-use link (committed),
// sends it, and records the outcome — a failed send voids its link. A failure backs off
// 1 min × 2^attempts (at most an hour) and is given up after 8 tries. Delivery is at least once: an SMTP
// acceptance whose record did not commit is sent again later with a new link (the newer voids the older).
import { createHash, randomBytes } from 'node:crypto';
import type { Response } from 'express';
import { addDays, addHours } from 'date-fns';
import type { EntityManager } from 'typeorm';
import type { AppDeps } from '../lib/context.js';
import type { TokenPurpose } from './auth-token.entity.js';
import * as repo from './auth.repository.js';
import { invitationMail, passwordResetMail } from './auth.mail.js';

type SenderDeps = Pick<AppDeps, 'config' | 'dataSource' | 'mailer' | 'logger' | 'clock'>;

export const validity: Record<TokenPurpose, (from: Date) => Date> = {
  invitation: (from) => addDays(from, 7),
  'password-reset': (from) => addHours(from, 1),
};

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

const LEASE_MS = 2 * 60_000;
const MAX_ATTEMPTS = 8;
const backoffMs = (attempts: number) => Math.min(60_000 * 2 ** (attempts - 1), 60 * 60_000);

/** Puts a link e-mail in the outbox, in the caller's transaction; it goes out after the response. */
export async function enqueueLinkMail(
  db: EntityManager,
  m: { organizationId: string; userId: string; purpose: TokenPurpose; at: Date },
): Promise<void> {
  await db.query(
    `INSERT INTO link_mails (organization_id, user_id, purpose, requested_at, next_attempt_at) VALUES ($1, $2, $3, $4, $4)`,
    [m.organizationId, m.userId, m.purpose, m.at],
  );
}

/**
 * Voids older links of the purpose and makes a new one, in the caller's transaction; returns the link and
 * the hash that names it (to void it again should the e-mail not go out).
 */
async function makeLink(deps: SenderDeps, db: EntityManager, userId: string, purpose: TokenPurpose) {
  const now = deps.clock.now();
  const token = randomBytes(32).toString('base64url');
  const expiresAt = validity[purpose](now);
  const tokenHash = hashToken(token);
  await repo.voidTokens(db, userId, now, purpose);
  await repo.insertToken(db, { userId, tokenHash, purpose, expiresAt, createdAt: now });
  return { link: `${deps.config.appUrl}/set-password?token=${encodeURIComponent(token)}`, tokenHash, expiresAt };
}

interface Claimed {
  id: string;
  userId: string;
  purpose: TokenPurpose;
  attempts: number;
}

interface Recipient {
  id: string;
  email: string;
  name: string;
  organizationName: string;
  active: boolean;
  hasPassword: boolean;
}

async function claimOne(db: EntityManager, now: Date, organizationId: string | null): Promise<Claimed | null> {
  const rows = await db.query<Claimed[]>(
    `WITH c AS (SELECT id FROM link_mails
                 WHERE status = 'pending' AND next_attempt_at <= $1 AND (claimed_until IS NULL OR claimed_until <= $1)
                   AND ($3::uuid IS NULL OR organization_id = $3)
                 ORDER BY next_attempt_at LIMIT 1 FOR UPDATE SKIP LOCKED),
          u AS (UPDATE link_mails m SET claimed_until = $2 FROM c WHERE m.id = c.id
                RETURNING m.id, m.user_id AS "userId", m.purpose, m.attempts)
     SELECT * FROM u`,
    [now, new Date(now.getTime() + LEASE_MS), organizationId],
  );
  return rows[0] ?? null;
}

async function recipient(db: EntityManager, userId: string): Promise<Recipient | null> {
  const rows = await db.query<Recipient[]>(
    `SELECT u.id, u.email, u.name, o.name AS "organizationName", u.active, (u.password_hash IS NOT NULL) AS "hasPassword"
       FROM users u JOIN organizations o ON o.id = u.organization_id WHERE u.id = $1`,
    [userId],
  );
  return rows[0] ?? null;
}

/** Why a claimed mail no longer applies, or null when it should be sent. */
function noLongerApplies(row: Claimed, user: Recipient | null): string | null {
  if (!user) return 'the person no longer exists';
  if (!user.active) return 'the account was deactivated';
  if (row.purpose === 'invitation' && user.hasPassword) return 'the person has chosen a password';
  return null;
}

/**
 * Sends every due link e-mail (of one company, or of all); returns how many were sent. Safe to run on
 * several instances at once.
 */
export async function sendDueLinkMails(deps: SenderDeps, organizationId: string | null = null): Promise<number> {
  let sent = 0;
  for (;;) {
    const now = deps.clock.now();
    const row = await claimOne(deps.dataSource.manager, now, organizationId);
    if (!row) return sent;
    // The link is made and committed first, the e-mail sent after (never inside a transaction that
    // may be tried again), and the link voided again when the e-mail does not go out.
    let made: (Awaited<ReturnType<typeof makeLink>> & { user: Recipient }) | null = null;
    try {
      made = await deps.dataSource.transaction(async (db) => {
        const user = await recipient(db, row.userId);
        const why = noLongerApplies(row, user);
        if (why) {
          await db.query(`UPDATE link_mails SET status = 'superseded', last_error = $2, claimed_until = NULL WHERE id = $1`, [
            row.id,
            why,
          ]);
          return null;
        }
        return { ...(await makeLink(deps, db, row.userId, row.purpose)), user: user! };
      });
      if (!made) continue;
      const { user, link, expiresAt } = made;
      const mail = { to: user.email, name: user.name, organizationName: user.organizationName, link, expiresAt };
      const { messageId } = await deps.mailer.send(row.purpose === 'invitation' ? invitationMail(mail) : passwordResetMail(mail));
      await deps.dataSource.manager.query(
        `UPDATE link_mails SET status = 'sent', sent_at = $2, message_id = $3, attempts = attempts + 1, claimed_until = NULL
          WHERE id = $1`,
        [row.id, deps.clock.now(), messageId],
      );
      sent++;
    } catch (err) {
      const attempts = row.attempts + 1;
      deps.logger.error({ err, linkMail: row.id, attempts }, 'could not send a link e-mail; will retry');
      const db = deps.dataSource.manager;
      if (made) await db.query(`UPDATE auth_tokens SET used_at = $2 WHERE token_hash = $1 AND used_at IS NULL`, [made.tokenHash, now]);
      await db.query(
        `UPDATE link_mails SET attempts = $2::int, last_error = $3, claimed_until = NULL,
                status = CASE WHEN $2::int >= $5::int THEN 'given_up' ELSE 'pending' END, next_attempt_at = $4
          WHERE id = $1`,
        [row.id, attempts, err instanceof Error ? err.message.slice(0, 500) : String(err), new Date(now.getTime() + backoffMs(attempts)), MAX_ATTEMPTS],
      );
    }
  }
}

/**
 * Runs the sender for the company once the response has gone out, so no request waits on the mail relay
 * (the schedule sweeps every company).
 */
export function sendLinkMailsAfter(res: Response, deps: SenderDeps, organizationId: string): void {
  res.once('finish', () => {
    sendDueLinkMails(deps, organizationId).catch((err: unknown) => deps.logger.error({ err }, 'link e-mail sender failed'));
  });
}
