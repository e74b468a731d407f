// Lapse watch: what a run would send (preview), the outbox step of a run for one company, the digest
// step, and the run history and notices for the Lapse watch page. The job (jobs/lapse-watch.job.ts)
// holds the advisory lock and calls the run steps; HTTP calls preview, history and notices.
import { addDays, type LapseNotice, type LapseWatchPreview, type LapseWatchRun } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { isoDay } from '../lib/dates.js';
import type { Actor } from '../lib/scope.js';
import { getCompanySettings } from '../settings/settings.repository.js';
import type { CompanySettingsValues } from '../settings/settings.repository.js';
import { digestMail, type DigestItem } from './digest-mail.js';
import * as repo from './lapse-watch.repository.js';

export type LapseWatchDeps = Pick<AppDeps, 'config' | 'dataSource' | 'mailer' | 'logger' | 'clock'>;

/** Deliveries are given up (status 'failed', shown on the Overview) after this many failed sends. */
export const MAX_SEND_ATTEMPTS = 5;

/** The window of a run: lapses since the company's previous run (or within the largest lead time of a
 *  first run, so that a first run does not dig up years of old lapses), and every lead time ahead. */
export async function scanWindow(
  db: AppDeps['dataSource']['manager'],
  organizationId: string,
  asOf: string,
  settings: CompanySettingsValues,
): Promise<repo.ScanWindow> {
  const previous = await repo.previousRunDay(db, organizationId, asOf);
  const maxLead = Math.max(...settings.warnDays);
  return {
    organizationId,
    asOf,
    lapsedSince: previous ?? addDays(asOf, -maxLead),
    warnDays: settings.warnDays,
  };
}

export async function preview(
  deps: AppDeps,
  actor: Actor,
  asOfInput: string | undefined,
): Promise<LapseWatchPreview> {
  const db = deps.dataSource.manager;
  const asOf = asOfInput ?? isoDay(deps.clock.now());
  const settings = await getCompanySettings(db, actor.organizationId);
  const window = await scanWindow(db, actor.organizationId, asOf, settings);
  const [candidates, recipients] = await Promise.all([
    repo.previewCandidates(db, window),
    repo.recipientsOf(db, actor.organizationId),
  ]);
  return {
    asOf,
    notices: candidates.map((c) => ({
      qualificationId: c.qualificationId,
      welder: { id: c.welderId, stamp: c.stamp, name: c.name },
      process: c.process as LapseWatchPreview['notices'][number]['process'],
      code: c.code as LapseWatchPreview['notices'][number]['code'],
      threshold: c.threshold,
      lapsesOn: c.lapsesOn,
      daysLeft: c.daysLeft,
      lastUse: c.lastUse,
      recipients: recipients
        .filter((r) => r.role === 'qa_manager' || r.shopIds.includes(c.homeShopId))
        .map((r) => ({ name: r.name, email: r.email })),
    })),
  };
}

/** The outbox step for one company: the run row and its new notices with their deliveries, in one transaction. */
export async function writeCompanyNotices(
  deps: LapseWatchDeps,
  run: {
    organizationId: string;
    asOf: string;
    trigger: LapseWatchRun['trigger'];
    instance: string;
    startedAt: Date;
  },
  settings: CompanySettingsValues,
): Promise<{ runId: string; noticesCreated: number }> {
  return deps.dataSource.transaction(async (db) => {
    const runId = await repo.insertRun(db, { ...run, status: 'done', finishedAt: null });
    const window = await scanWindow(db, run.organizationId, run.asOf, settings);
    const noticesCreated = await repo.writeNotices(db, window, runId, deps.clock.now());
    return { runId, noticesCreated };
  });
}

/** One qualification once in a digest, even when it crossed two lead times at once. */
function itemsOf(lines: repo.DigestLine[]): DigestItem[] {
  const seen = new Map<string, DigestItem>();
  for (const l of lines) if (!seen.has(l.qualificationId)) seen.set(l.qualificationId, l);
  return [...seen.values()];
}

/**
 * The digest step for one company: one e-mail per recipient with all of their due deliveries. Each
 * recipient's deliveries are claimed (FOR UPDATE SKIP LOCKED) and marked in the transaction that sends,
 * so a concurrent sender skips them and a sent notice is never sent again.
 */
export async function sendCompanyDigests(
  deps: LapseWatchDeps,
  organizationId: string,
  companyName: string,
  asOf: string,
): Promise<{ emailsSent: number; emailsFailed: number }> {
  const now = deps.clock.now();
  const users = await repo.dueRecipients(deps.dataSource.manager, organizationId, now);
  let emailsSent = 0;
  let emailsFailed = 0;
  for (const userId of users) {
    const outcome = await deps.dataSource.transaction(async (db) => {
      const lines = await repo.claimDueDeliveries(db, organizationId, userId, now);
      const first = lines[0];
      if (!first) return 'none' as const;
      const ids = lines.map((l) => l.deliveryId);
      const mail = digestMail({
        to: first.email,
        recipientName: first.recipientName,
        companyName,
        asOf,
        appUrl: deps.config.appUrl,
        items: itemsOf(lines),
      });
      try {
        await deps.mailer.send(mail);
      } catch (err) {
        const message = err instanceof Error ? err.message : String(err);
        await repo.markFailed(db, ids, now, message, MAX_SEND_ATTEMPTS);
        deps.logger.warn(
          { organizationId, userId, deliveries: ids.length, err: message },
          'lapse digest not sent; will retry',
        );
        return 'failed' as const;
      }
      await repo.markSent(db, ids, now);
      return 'sent' as const;
    });
    if (outcome === 'sent') emailsSent++;
    if (outcome === 'failed') emailsFailed++;
  }
  return { emailsSent, emailsFailed };
}

export async function listRuns(deps: AppDeps, actor: Actor): Promise<{ items: LapseWatchRun[] }> {
  return { items: await repo.listRuns(deps.dataSource.manager, actor.organizationId, 50) };
}

export async function latestRun(deps: AppDeps, organizationId: string): Promise<LapseWatchRun | null> {
  const [run] = await repo.listRuns(deps.dataSource.manager, organizationId, 1);
  return run ?? null;
}

export async function listNotices(
  deps: AppDeps,
  actor: Actor,
  status: 'pending' | 'sent' | 'failed' | undefined,
): Promise<{ items: LapseNotice[] }> {
  const rows = await repo.listNotices(deps.dataSource.manager, actor.organizationId, status ?? null, 200);
  return {
    items: rows.map((n) => ({
      ...n,
      process: n.process as LapseNotice['process'],
      code: n.code as LapseNotice['code'],
      createdAt: n.createdAt.toISOString(),
      deliveries: n.deliveries.map((d) => ({
        ...d,
        nextAttemptAt: d.nextAttemptAt ? new Date(d.nextAttemptAt).toISOString() : null,
        sentAt: d.sentAt ? new Date(d.sentAt).toISOString() : null,
      })),
    })),
  };
}
