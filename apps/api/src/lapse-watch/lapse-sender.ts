// The sender: delivers the pending notices of the outbox, whatever wrote them (a lapse-watch run or a
// change that moved a lapse date). It runs every few minutes (jobs/lapse-watch.job.ts) and right after
// each run. For each recipient with due deliveries:
//
//   1. claim them with a lease (one committed statement; a concurrent sender skips them, and the lease
//      runs out if this process dies, so another sender takes over),
//   2. re-check each one against the records as they are now and drop those that no longer apply
//      (status 'superseded', with the reason),
//   3. send one digest e-mail with the rest (the lapses, then the welds newly flagged by a re-check),
//   4. record the SMTP server's acceptance and message id in one statement straight away, or the failure
//      with its backoff (15 min × 2^attempts, given up after MAX_SEND_ATTEMPTS).
//
// Delivery is at least once: the only way a notice is sent twice is the SMTP server accepting the digest
// and step 4 then failing to commit (database unreachable, process killed in that instant) — the lease
// then runs out and the digest goes again. Step 4 is retried briefly to keep that window small.
import { randomUUID } from 'node:crypto';
import { setTimeout as sleep } from 'node:timers/promises';
import type { AppDeps } from '../lib/context.js';
import { todayIn } from '../lib/dates.js';
import { settingsOfCompanies } from '../settings/settings.repository.js';
import { digestMail, type DigestItem, type DigestWeld } from './digest-mail.js';
import * as repo from './lapse-watch.repository.js';

export type SenderDeps = Pick<AppDeps, 'config' | 'dataSource' | 'mailer' | 'logger' | 'clock'>;

/** Deliveries are given up (status 'failed', shown on the Overview) after this many failed sends. */
export const MAX_SEND_ATTEMPTS = 5;
/** How long a claim holds: far longer than one SMTP exchange (its timeouts add up to 20 s). */
export const CLAIM_LEASE_MS = 2 * 60_000;

export interface SendOutcome {
  emailsSent: number;
  emailsFailed: number;
  superseded: number;
  /** Deliveries whose acceptance could not be recorded before their claim ran out (possible duplicates). */
  lostClaims: number;
}

export interface SendOptions {
  /** Only these companies; default all. */
  organizationIds?: string[] | null;
  leaseMs?: number;
  /** Between the claim and the send (tests simulate a process dying there). */
  afterClaim?: (claimed: string[]) => Promise<void>;
}

/** One item per qualification in a digest, even when it crossed two lead times at once. */
function itemsOf(lines: repo.ClaimedLine[]): DigestItem[] {
  const seen = new Map<string, DigestItem>();
  for (const l of lines) if (!seen.has(l.qualificationId)) seen.set(l.qualificationId, l);
  return [...seen.values()];
}

/** One entry per weld in a digest, even when two re-checks flagged it before the digest went. */
function weldsOf(lines: repo.ClaimedWeldLine[]): DigestWeld[] {
  const seen = new Map<string, DigestWeld>();
  for (const l of lines) if (!seen.has(l.weldId)) seen.set(l.weldId, l);
  return [...seen.values()];
}

async function persistently<T>(deps: SenderDeps, what: string, run: () => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if (attempt >= 4) throw err;
      deps.logger.warn({ err, attempt }, `${what} failed; trying again`);
      await sleep(250 * attempt);
    }
  }
}

/** Sends every due delivery (of the given companies) once; returns what happened. */
export async function sendDueNotices(deps: SenderDeps, opts: SendOptions = {}): Promise<SendOutcome> {
  const db = deps.dataSource.manager;
  const only = opts.organizationIds ?? null;
  const leaseMs = opts.leaseMs ?? CLAIM_LEASE_MS;
  const outcome: SendOutcome = { emailsSent: 0, emailsFailed: 0, superseded: 0, lostClaims: 0 };
  const start = deps.clock.now();
  await repo.addNewSupervisors(db, only, start);
  const due = await repo.dueRecipients(db, only, start);
  if (due.length === 0) {
    await repo.settleRuns(db, only, start);
    return outcome;
  }
  const companies = [...new Set(due.map((d) => d.organizationId))];
  const [settings, names] = await Promise.all([
    settingsOfCompanies(db, companies),
    db.query<{ id: string; name: string }[]>(`SELECT id, name FROM organizations WHERE id = ANY($1::uuid[])`, [
      companies,
    ]),
  ]);
  const nameOf = new Map(names.map((n) => [n.id, n.name]));

  for (const { organizationId, userId } of due) {
    const now = deps.clock.now();
    const today = todayIn(settings.get(organizationId)?.timeZone ?? 'UTC', now);
    const token = randomUUID();
    const claimed = await repo.claimDue(db, organizationId, userId, token, now, leaseMs);
    if (claimed.length === 0) continue;
    await opts.afterClaim?.(claimed);

    const lapseLines = await repo.recheckClaimed(db, token, today);
    const weldLines = await repo.recheckClaimedWelds(db, token);
    const lines = [...lapseLines, ...weldLines];
    const stale = lines.filter((l) => l.stale !== null);
    await repo.markSuperseded(
      db,
      token,
      stale.map((l) => ({ deliveryId: l.deliveryId, reason: l.stale! })),
      now,
    );
    outcome.superseded += stale.length;
    const live = lines.filter((l) => l.stale === null);
    const first = live[0];
    if (!first) continue;
    const ids = live.map((l) => l.deliveryId);
    const mail = digestMail({
      to: first.email,
      recipientName: first.recipientName,
      companyName: nameOf.get(organizationId) ?? '',
      asOf: today,
      appUrl: deps.config.appUrl,
      items: itemsOf(lapseLines.filter((l) => l.stale === null)),
      welds: weldsOf(weldLines.filter((l) => l.stale === null)),
    });

    let messageId: string;
    try {
      ({ messageId } = await deps.mailer.send(mail));
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      await repo.markFailed(db, token, ids, deps.clock.now(), message, MAX_SEND_ATTEMPTS);
      deps.logger.warn(
        { organizationId, userId, deliveries: ids.length, err: message },
        'lapse digest not sent; will retry',
      );
      outcome.emailsFailed++;
      continue;
    }
    const recorded = await persistently(deps, 'recording a sent digest', () =>
      repo.markSent(db, token, ids, first.email, messageId, deps.clock.now()),
    );
    outcome.emailsSent++;
    if (recorded < ids.length) {
      outcome.lostClaims += ids.length - recorded;
      deps.logger.warn(
        { organizationId, userId, messageId, deliveries: ids.length, recorded },
        'lapse digest sent after its claim ran out; another sender may send it again',
      );
    }
  }
  await repo.settleRuns(db, only, deps.clock.now());
  return outcome;
}
