// The lapse-watch job: an entry point like HTTP (schedule, CLI and "run now" all come here). It holds a
// PostgreSQL session advisory lock on one dedicated connection for the whole run, so of two instances
// started together only one works; the other records a 'skipped' run and logs it. The lock goes with
// the connection, so a crashed run never leaves it held.
import { hostname } from 'node:os';
import cron from 'node-cron';
import { format } from 'date-fns';
import type { LapseWatchRun } from '@beadroll/rules';
import { isoDay } from '../lib/dates.js';
import { settingsOfCompanies } from '../settings/settings.repository.js';
import * as repo from '../lapse-watch/lapse-watch.repository.js';
import {
  sendCompanyDigests,
  writeCompanyNotices,
  type LapseWatchDeps,
} from '../lapse-watch/lapse-watch.service.js';

const LOCK = `hashtext('beadroll.lapse-watch')`;

export interface LapseWatchOptions {
  /** Day to judge lapses on; default today (server time zone). */
  asOf?: string;
  trigger: LapseWatchRun['trigger'];
  /** Only these companies; default all. */
  organizationIds?: string[];
  /** Name of this instance in the run history; default host:pid. */
  instance?: string;
  /** Stops a run between companies (shutdown); companies not reached wait for the next run. */
  signal?: AbortSignal;
}

export async function runLapseWatch(deps: LapseWatchDeps, opts: LapseWatchOptions): Promise<LapseWatchRun[]> {
  const startedAt = deps.clock.now();
  const asOf = opts.asOf ?? isoDay(startedAt);
  const instance = opts.instance ?? `${hostname()}:${process.pid}`;
  const only = opts.organizationIds ?? null;
  const lockHolder = deps.dataSource.createQueryRunner();
  await lockHolder.connect();
  try {
    const [lock] = (await lockHolder.query(`SELECT pg_try_advisory_lock(${LOCK}) AS locked`)) as {
      locked: boolean;
    }[];
    if (!lock?.locked) {
      const organizationId = only?.length === 1 ? only[0]! : null;
      const id = await repo.insertRun(deps.dataSource.manager, {
        organizationId,
        asOf,
        trigger: opts.trigger,
        instance,
        status: 'skipped',
        startedAt,
        finishedAt: deps.clock.now(),
        error: 'Another instance is running lapse watch',
      });
      deps.logger.warn(
        { asOf, trigger: opts.trigger, instance },
        'lapse watch skipped: another instance holds the lock',
      );
      return [(await repo.findRun(deps.dataSource.manager, id))!];
    }
    try {
      return await runLocked(deps, {
        asOf,
        trigger: opts.trigger,
        instance,
        only,
        startedAt,
        signal: opts.signal,
      });
    } finally {
      await lockHolder.query(`SELECT pg_advisory_unlock(${LOCK})`);
    }
  } finally {
    await lockHolder.release();
  }
}

async function runLocked(
  deps: LapseWatchDeps,
  p: {
    asOf: string;
    trigger: LapseWatchRun['trigger'];
    instance: string;
    only: string[] | null;
    startedAt: Date;
    signal: AbortSignal | undefined;
  },
): Promise<LapseWatchRun[]> {
  const db = deps.dataSource.manager;
  const [companies, settings] = await Promise.all([
    repo.companiesOf(db, p.only),
    settingsOfCompanies(db, p.only),
  ]);
  const runs: LapseWatchRun[] = [];
  for (const company of companies) {
    if (p.signal?.aborted) break;
    const base = { organizationId: company.id, asOf: p.asOf, trigger: p.trigger, instance: p.instance };
    let runId: string | null = null;
    try {
      const written = await writeCompanyNotices(
        deps,
        { ...base, startedAt: p.startedAt },
        settings.get(company.id)!,
      );
      runId = written.runId;
      const sent = await sendCompanyDigests(deps, company.id, company.name, p.asOf);
      await repo.finishRun(db, runId, {
        status: 'done',
        noticesCreated: written.noticesCreated,
        ...sent,
        error: null,
        finishedAt: deps.clock.now(),
      });
      deps.logger.info(
        { ...base, runId, noticesCreated: written.noticesCreated, ...sent },
        'lapse watch done',
      );
    } catch (err) {
      // One company's failure is recorded and does not stop the others.
      const error = err instanceof Error ? err.message : String(err);
      deps.logger.error({ ...base, err }, 'lapse watch failed');
      const failed = {
        status: 'failed' as const,
        noticesCreated: 0,
        emailsSent: 0,
        emailsFailed: 0,
        error,
        finishedAt: deps.clock.now(),
      };
      if (runId) await repo.finishRun(db, runId, failed);
      else
        runId = await repo.insertRun(db, {
          ...base,
          status: 'failed',
          startedAt: p.startedAt,
          finishedAt: failed.finishedAt,
          error,
        });
    }
    runs.push((await repo.findRun(db, runId))!);
  }
  return runs;
}

/**
 * One tick of the daily schedule at `now`: a run for the companies whose lapse_watch_time (HH:MM, server
 * time zone) has come and that have no scheduled run for today (the API's calendar day) yet.
 * `among` narrows the companies considered (tests).
 */
export async function runDueLapseWatch(
  deps: LapseWatchDeps,
  now: Date = deps.clock.now(),
  among?: string[],
  signal?: AbortSignal,
): Promise<LapseWatchRun[]> {
  const due = await repo.dueCompanies(
    deps.dataSource.manager,
    isoDay(now),
    format(now, 'HH:mm'),
    among ?? null,
  );
  return due.length > 0
    ? runLapseWatch(deps, {
        asOf: isoDay(now),
        trigger: 'schedule',
        organizationIds: due,
        ...(signal ? { signal } : {}),
      })
    : [];
}

/**
 * The daily schedule: a node-cron task every minute runs the tick above. One cron for every company's
 * time keeps a changed setting effective at once; the advisory lock keeps two instances from both
 * running it (the second records a skip).
 */
export function startLapseWatchSchedule(deps: LapseWatchDeps): { stop(): Promise<void> } {
  let running: Promise<unknown> | null = null;
  const stopping = new AbortController();
  const task = cron.schedule('* * * * *', () => {
    if (running) return;
    running = runDueLapseWatch(deps, deps.clock.now(), undefined, stopping.signal)
      .catch((err: unknown) => deps.logger.error({ err }, 'lapse-watch schedule tick failed'))
      .finally(() => {
        running = null;
      });
  });
  return {
    async stop() {
      stopping.abort();
      await task.stop();
      await running;
    },
  };
}
