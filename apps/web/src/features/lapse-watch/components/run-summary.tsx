// One lapse-watch run in words: when, what started it, how it ended and what it sent.
import { formatDay, formatInstant, type LapseWatchRun } from '@beadroll/rules';

export const triggerWords = { manual: 'Run now', cli: 'Command line', schedule: 'Daily schedule' } as const;

export function RunSummary({ run, timeZone }: { run: LapseWatchRun | null; timeZone: string }) {
  if (!run) return <p className="text-stone-600">Lapse watch has not run yet.</p>;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1">
      <dt className="text-stone-500">When</dt>
      <dd>{formatInstant(run.startedAt, timeZone, 'long')} (for {formatDay(run.asOf, 'long')})</dd>
      <dt className="text-stone-500">Started by</dt>
      <dd>{triggerWords[run.trigger]}</dd>
      <dt className="text-stone-500">Result</dt>
      <dd>
        {run.status === 'done'
          ? 'Done'
          : run.status === 'sending'
            ? 'Sending (retries pending)'
            : run.status === 'skipped'
              ? 'Skipped (another server ran it)'
              : `Failed: ${run.error ?? ''}`}
      </dd>
      <dt className="text-stone-500">Notices</dt>
      <dd>
        {run.noticesCreated} new · {run.emailsSent} e-mails sent{run.emailsFailed ? ` · ${run.emailsFailed} failed` : ''}
        {run.emailsSuperseded ? ` · ${run.emailsSuperseded} dropped (no longer applied)` : ''}
      </dd>
    </dl>
  );
}

