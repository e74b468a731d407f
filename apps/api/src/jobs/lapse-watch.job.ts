// The lapse-watch job: an entry point like HTTP (schedule, CLI and "run now" all come here), and the
// frequent sender.
//
// A run holds a PostgreSQL session advisory lock on one dedicated connection while it writes, so of two
// instances started together only one works; the other records a 'skipped' run for each company it was
// asked to run (never shown to another company) and logs it. A scheduled run asks again, under the lock,
// which of its companies still have no scheduled run today, so an instance that found a day due just
// before another finished it does not run it a second time. The lock goes with the connection, so a
// crashed run never leaves it held. Each company's run is dated today in the company's own time zone —
// never another day (Preview looks at other days) — and stays 'sending' until the sender has settled
// every delivery of its notices.
//
// The sender (lapse-watch/lapse-sender.ts) runs every few minutes under its own advisory lock (so
// instances take turns instead of all polling at once), and right after each run without the lock: its
// leased claims, not the lock, keep two senders from sending the same delivery.
import { hostname } from 'node:os';
import cron from 'node-cron';
import type { LapseWatchRun } from '@beadroll/rules';
import { AppError } from '../lib/errors.js';
import { wallTimeIn } from '../lib/dates.js';
import { settingsOfCompanies } from '../settings/settings.repository.js';
import * as repo from '../lapse-watch/lapse-watch.repository.js';
import { writeCompanyNotices, type LapseWatchDeps } from '../lapse-watch/lapse-watch.service.js';
import { sendDueNotices, type SendOptions, type SendOutcome } from '../lapse-watch/lapse-sender.js';

const RUN_LOCK = `hashtext('beadroll.lapse-watch')`;
const SENDER_LOCK = `hashtext('beadroll.lapse-sender')`;

export interface LapseWatchOptions {
  /** Must be today in each company's time zone when given (a guard for the CLI and "Run now"). */
  asOf?: string;
  trigger: LapseWatchRun['trigger'];
  /** Only these companies; default all. */
  organizationIds?: string[];
  /** Name of this instance in the logs and the database; default host:pid. */
  instance?: string;
  /** Stops a run between companies (shutdown); companies not reached wait for the next run. */
  signal?: AbortSignal;
  /** The instant of the run (the schedule's tick); default the clock's now. */
  at?: Date;
}

const instanceName = () => `${hostname()}:${process.pid}`;

/** Each covered company with its today; a given asOf that is not some company's today is refused. */
async function companyDays(deps: LapseWatchDeps, opts: LapseWatchOptions, at: Date) {
  const db = deps.dataSource.manager;
  const only = opts.organizationIds ?? null;
  const [companies, settings] = await Promise.all([repo.companiesOf(db, only), settingsOfCompanies(db, only)]);
  const days = companies.map((c) => {
    const s = settings.get(c.id)!;
    return { ...c, settings: s, today: wallTimeIn(s.timeZone, at).day };
  });
  const wrong = opts.asOf ? days.find((d) => d.today !== opts.asOf) : undefined;
  if (wrong)
    throw AppError.validation(
      {
        asOf: `A run can only be dated today: ${wrong.today} in ${wrong.settings.timeZone}. Use Preview to look at other days.`,
      },
      'A lapse-watch run sends real notices and can only be dated today',
    );
  return days;
}

export async function runLapseWatch(deps: LapseWatchDeps, opts: LapseWatchOptions): Promise<LapseWatchRun[]> {
  const startedAt = opts.at ?? deps.clock.now();
  const instance = opts.instance ?? instanceName();
  const companies = await companyDays(deps, opts, startedAt);
  const lockHolder = deps.dataSource.createQueryRunner();
  await lockHolder.connect();
  try {
    const [lock] = (await lockHolder.query(`SELECT pg_try_advisory_lock(${RUN_LOCK}) AS locked`)) as {
      locked: boolean;
    }[];
    if (!lock?.locked) {
      const runs: LapseWatchRun[] = [];
      for (const c of companies) {
        const id = await repo.insertRun(deps.dataSource.manager, {
          organizationId: c.id,
          asOf: c.today,
          trigger: opts.trigger,
          instance,
          status: 'skipped',
          startedAt,
          finishedAt: deps.clock.now(),
          error: 'Another server was running lapse watch at the same moment; it did the work',
        });
        runs.push((await repo.findRun(deps.dataSource.manager, id))!);
      }
      deps.logger.warn({ trigger: opts.trigger, instance }, 'lapse watch skipped: another instance holds the lock');
      return runs;
    }
    try {
      // The schedule decided what was due before it held the lock; another instance may have run those
      // days since (it committed its run before letting go of the lock). Asked again under the lock, a
      // company's scheduled day runs exactly once, however many instances tick at the same moment.
      const todo =
        opts.trigger === 'schedule'
          ? await notYetScheduled(deps, companies)
          : companies;
      if (todo.length < companies.length)
        deps.logger.info(
          { trigger: opts.trigger, instance, alreadyRun: companies.length - todo.length },
          'lapse watch: another instance has already run these companies today',
        );
      return await runLocked(deps, { companies: todo, trigger: opts.trigger, instance, startedAt, signal: opts.signal });
    } finally {
      await lockHolder.query(`SELECT pg_advisory_unlock(${RUN_LOCK})`);
    }
  } finally {
    await lockHolder.release();
  }
}

async function notYetScheduled(deps: LapseWatchDeps, companies: Awaited<ReturnType<typeof companyDays>>) {
  const done = await repo.scheduledRunDays(
    deps.dataSource.manager,
    companies.map((c) => ({ organizationId: c.id, day: c.today })),
  );
  return companies.filter((c) => !done.has(c.id));
}

async function runLocked(
  deps: LapseWatchDeps,
  p: {
    companies: Awaited<ReturnType<typeof companyDays>>;
    trigger: LapseWatchRun['trigger'];
    instance: string;
    startedAt: Date;
    signal: AbortSignal | undefined;
  },
): Promise<LapseWatchRun[]> {
  const db = deps.dataSource.manager;
  const runs: LapseWatchRun[] = [];
  for (const company of p.companies) {
    if (p.signal?.aborted) break;
    const base = { organizationId: company.id, asOf: company.today, trigger: p.trigger, instance: p.instance };
    let runId: string;
    try {
      const written = await writeCompanyNotices(deps, { ...base, startedAt: p.startedAt }, company.settings);
      runId = written.runId;
      deps.logger.info({ ...base, runId, noticesCreated: written.noticesCreated }, 'lapse watch notices written');
    } catch (err) {
      // One company's failure is recorded and does not stop the others; the day is not done.
      const error = err instanceof Error ? err.message : String(err);
      deps.logger.error({ ...base, err }, 'lapse watch failed');
      runId = await repo.insertRun(db, {
        ...base,
        status: 'failed',
        startedAt: p.startedAt,
        finishedAt: deps.clock.now(),
        error,
      });
      runs.push((await repo.findRun(db, runId))!);
      continue;
    }
    try {
      // Send straight away; what fails here is retried by the frequent sender, which finishes the run.
      await sendDueNotices(deps, { organizationIds: [company.id] });
    } catch (err) {
      deps.logger.error({ ...base, runId, err }, 'lapse watch: sending interrupted; the sender will carry on');
    }
    runs.push((await repo.findRun(db, runId))!);
  }
  return runs;
}

/**
 * One tick of the daily schedule at `now`: a run for each company whose lapse_watch_time (HH:MM on the
 * company's own wall clock) has come today (the company's day) and that has no scheduled run for that
 * day yet. `among` narrows the companies considered (tests).
 */
export async function runDueLapseWatch(
  deps: LapseWatchDeps,
  now: Date = deps.clock.now(),
  among?: string[],
  signal?: AbortSignal,
): Promise<LapseWatchRun[]> {
  const db = deps.dataSource.manager;
  const settings = await settingsOfCompanies(db, among ?? null);
  const timeHas = [...settings].flatMap(([organizationId, s]) => {
    const wall = wallTimeIn(s.timeZone, now);
    return wall.hhmm >= s.lapseWatchTime ? [{ organizationId, day: wall.day }] : [];
  });
  const done = await repo.scheduledRunDays(db, timeHas);
  const due = timeHas.filter((d) => !done.has(d.organizationId)).map((d) => d.organizationId);
  deps.logger.debug({ due: due.length, alreadyRun: done.size }, 'lapse watch tick');
  return due.length > 0
    ? runLapseWatch(deps, { trigger: 'schedule', organizationIds: due, at: now, ...(signal ? { signal } : {}) })
    : [];
}

/**
 * One tick of the frequent sender: sends what is due under the sender lock; null when another instance
 * holds it (it is sending right now).
 */
export async function runSenderTick(deps: LapseWatchDeps, opts: SendOptions = {}): Promise<SendOutcome | null> {
  const lockHolder = deps.dataSource.createQueryRunner();
  await lockHolder.connect();
  try {
    const [lock] = (await lockHolder.query(`SELECT pg_try_advisory_lock(${SENDER_LOCK}) AS locked`)) as {
      locked: boolean;
    }[];
    if (!lock?.locked) return null;
    try {
      return await sendDueNotices(deps, opts);
    } finally {
      await lockHolder.query(`SELECT pg_advisory_unlock(${SENDER_LOCK})`);
    }
  } finally {
    await lockHolder.release();
  }
}

/** How often the sender looks for due deliveries (the first retry comes 15 minutes after a failure). */
export const SENDER_CRON = '*/2 * * * *';

/**
 * The schedule: node-cron every minute (LAPSE_WATCH_TICK) runs the daily tick above (one cron for every company's time keeps
 * a changed setting effective at once), and every two minutes the sender. Neither tick starts while its
 * previous one is still running.
 */
export function startLapseWatchSchedule(deps: LapseWatchDeps): { stop(): Promise<void> } {
  let running: Promise<unknown> | null = null;
  let sending: Promise<unknown> | null = null;
  const stopping = new AbortController();
  const daily = cron.schedule(deps.config.lapseWatchTick, () => {
    if (running) return;
    running = runDueLapseWatch(deps, deps.clock.now(), undefined, stopping.signal)
      .catch((err: unknown) => deps.logger.error({ err }, 'lapse-watch schedule tick failed'))
      .finally(() => {
        running = null;
      });
  });
  const sender = cron.schedule(SENDER_CRON, () => {
    if (sending || stopping.signal.aborted) return;
    sending = runSenderTick(deps)
      .catch((err: unknown) => deps.logger.error({ err }, 'lapse sender tick failed'))
      .finally(() => {
        sending = null;
      });
  });
  return {
    async stop() {
      stopping.abort();
      await Promise.all([daily.stop(), sender.stop()]);
      await Promise.all([running, sending]);
    },
  };
}
