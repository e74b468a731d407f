// Lapse watch: what a run would send (preview), the outbox step of a run for one company, and the run
// history and notices for the Lapse watch page. The job (jobs/lapse-watch.job.ts) holds the advisory
// lock and calls the run step, then the sender (lapse-sender.ts); HTTP calls preview, history and notices.
import { addDays, type LapseNotice, type LapseWatchPreview, type LapseWatchRun } from '@beadroll/rules';
import type { AppDeps } from '../lib/context.js';
import { todayIn } from '../lib/dates.js';
import type { Actor } from '../lib/scope.js';
import { getCompanySettings } from '../settings/settings.repository.js';
import type { CompanySettingsValues } from '../settings/settings.repository.js';
import * as repo from './lapse-watch.repository.js';
import type { SenderDeps } from './lapse-sender.js';

export type LapseWatchDeps = SenderDeps;


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
  const settings = await getCompanySettings(db, actor.organizationId);
  // Any day, ahead or back: a preview only reads.
  const asOf = asOfInput ?? todayIn(settings.timeZone, deps.clock);
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

/**
 * The outbox step for one company: the run row ('sending' until the sender has settled every delivery of
 * its notices) and its new notices with their deliveries, in one transaction — a crash before the commit
 * leaves no trace and the day is run again; after it, the sender finishes the run.
 */
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
    const runId = await repo.insertRun(db, { ...run, status: 'sending', finishedAt: null });
    const window = await scanWindow(db, run.organizationId, run.asOf, settings);
    const noticesCreated = await repo.writeNotices(db, window, runId, deps.clock.now());
    await repo.setNoticesCreated(db, runId, noticesCreated);
    return { runId, noticesCreated };
  });
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
  status: 'pending' | 'sent' | 'failed' | 'superseded' | undefined,
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
