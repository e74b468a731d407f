// Lapse watch (QA manager): what the daily job would send on any chosen day, ahead or back (a preview
// writes and sends nothing), running it for today — the company's today, the only day a run can have —
// after confirming, the history of runs and the notices with each delivery's state.
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { SelectField, TextField } from '@/components/ui/field';
import { Card, PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { lapseWatchQueries, useRunLapseWatch } from '@/features/lapse-watch/api/lapse-watch-queries';
import { triggerWords } from '@/features/lapse-watch/components/run-summary';
import { daysText } from '@/components/ui/qualification-chip';
import { errorMessage } from '@/lib/api-client';
import { displayName, formatInstant } from '@beadroll/rules';

const thresholdWords = (t: string) =>
  t === 'lapsed' ? 'Lapsed' : t === 'restored' ? 'Back in continuity' : `${t}-day warning`;
const deliveryTone = {
  sent: 'text-emerald-800',
  pending: 'text-amber-800',
  failed: 'text-red-800',
  superseded: 'text-stone-600',
} as const;
const deliveryWords = { sent: '✓ sent', pending: '… pending', failed: '✕ failed', superseded: '– not sent, no longer applied' } as const;
const runStatusWords = (r: { status: string; error: string | null }) =>
  r.status === 'done'
    ? 'Done'
    : r.status === 'sending'
      ? 'Sending (retries pending)'
      : r.status === 'skipped'
        ? 'Skipped (another server ran it)'
        : `Failed${r.error ? `: ${r.error}` : ''}`;

function LapseWatchRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Lapse watch" message="Lapse watch is run by the QA manager.">
      <LapseWatchScreen />
    </RequireRole>
  );
}

export default LapseWatchRoute;

function LapseWatchScreen() {
  const settings = useQuery(lapseWatchQueries.settings());
  if (settings.isPending) return <LoadingState label="Loading lapse watch…" />;
  if (settings.isError) return <ErrorState error={settings.error} onRetry={() => void settings.refetch()} />;
  return <LapseWatchPanels today={settings.data.today} timeZone={settings.data.timeZone} />;
}

function LapseWatchPanels({ today, timeZone }: { today: string; timeZone: string }) {
  const [asOf, setAsOf] = useState(today);
  const [previewFor, setPreviewFor] = useState<string | null>(null);
  const [confirming, setConfirming] = useState(false);
  const run = useRunLapseWatch();
  const preview = useQuery({ ...lapseWatchQueries.preview(previewFor ?? ''), enabled: previewFor !== null });
  const runs = useQuery(lapseWatchQueries.runs());
  const [status, setStatus] = useState<'' | 'pending' | 'sent' | 'failed' | 'superseded'>('');
  const notices = useQuery(lapseWatchQueries.notices(status || undefined));

  return (
    <>
      <PageHeader
        title="Lapse watch"
        description="Every day Beadroll warns each shop's foremen and the QA managers of qualifications about to lapse. Preview what a run would send, or run it now."
      />
      <Card className="mb-5 p-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <div className="flex flex-wrap items-end gap-3">
            <TextField
              label="Preview as of"
              hint="Any day, ahead or back; a preview sends and writes nothing."
              type="date"
              wrapperClassName="w-56"
              value={asOf}
              onChange={(e) => setAsOf(e.target.value)}
            />
            <Button onClick={() => setPreviewFor(asOf)} disabled={!asOf}>
              Preview
            </Button>
          </div>
          <div className="text-right">
            <Button variant="primary" onClick={() => setConfirming(true)}>
              Run for today ({today})
            </Button>
            <p className="mt-1 text-xs text-stone-600">Today in {timeZone.replaceAll('_', ' ')}, the company&apos;s time zone.</p>
          </div>
        </div>
        {previewFor !== null && (
          <div className="mt-4">
            {preview.isPending ? (
              <LoadingState label="Working out what would be sent…" />
            ) : preview.isError ? (
              <ErrorState error={preview.error} />
            ) : preview.data.notices.length === 0 ? (
              <p className="text-sm text-stone-600">Nothing would be sent for {preview.data.asOf}.</p>
            ) : (
              <>
                <h2 className="mb-2 font-semibold">
                  Preview for {preview.data.asOf}: {preview.data.notices.length} {preview.data.notices.length === 1 ? 'notice' : 'notices'} (nothing sent)
                </h2>
                <div className="overflow-x-auto">
                  <table className="min-w-full text-sm" aria-label="Preview">
                    <thead className="bg-stone-50 text-left">
                      <tr>
                        <th scope="col" className="px-3 py-2">Welder</th>
                        <th scope="col" className="px-3 py-2">Process · code</th>
                        <th scope="col" className="px-3 py-2">Notice</th>
                        <th scope="col" className="px-3 py-2">Lapses on</th>
                        <th scope="col" className="px-3 py-2">Last logged use</th>
                        <th scope="col" className="px-3 py-2">To</th>
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-stone-100">
                      {preview.data.notices.map((n) => (
                        <tr key={`${n.qualificationId}:${n.threshold}`}>
                          <td className="px-3 py-2">
                            <Link className="font-semibold text-accent-700 hover:underline" to={paths.welder.href(n.welder.id)}>
                              {n.welder.stamp}
                            </Link>{' '}
                            {n.welder.name}
                          </td>
                          <td className="px-3 py-2">
                            {n.process} · {displayName('codes', n.code)}
                          </td>
                          <td className="px-3 py-2">{thresholdWords(n.threshold)}</td>
                          <td className="px-3 py-2 tabular-nums">
                            {n.lapsesOn} <span className="text-stone-500">({daysText(n.daysLeft)})</span>
                          </td>
                          <td className="px-3 py-2 tabular-nums">{n.lastUse ?? 'none'}</td>
                          <td className="px-3 py-2">{n.recipients.map((r) => r.name).join(', ') || 'nobody'}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </>
            )}
          </div>
        )}
      </Card>

      <section aria-labelledby="runs-heading" className="mb-5">
        <h2 id="runs-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">Runs</h2>
        {runs.isPending ? (
          <LoadingState label="Loading runs…" />
        ) : runs.isError ? (
          <ErrorState error={runs.error} onRetry={() => void runs.refetch()} />
        ) : runs.data.length === 0 ? (
          <EmptyState title="No runs yet">The daily schedule or "Run now" starts the first run.</EmptyState>
        ) : (
          <Card className="overflow-x-auto">
            <table className="min-w-full text-sm" aria-label="Runs">
              <thead className="bg-stone-50 text-left">
                <tr>
                  <th scope="col" className="px-3 py-2">When</th>
                  <th scope="col" className="px-3 py-2">As of</th>
                  <th scope="col" className="px-3 py-2">Started by</th>
                  <th scope="col" className="px-3 py-2">Status</th>
                  <th scope="col" className="px-3 py-2 text-right">New notices</th>
                  <th scope="col" className="px-3 py-2 text-right">E-mails sent</th>
                  <th scope="col" className="px-3 py-2 text-right">E-mails failed</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-stone-100">
                {runs.data.map((r) => (
                  <tr key={r.id}>
                    <td className="px-3 py-2 tabular-nums">{formatInstant(r.startedAt, timeZone)}</td>
                    <td className="px-3 py-2 tabular-nums">{r.asOf}</td>
                    <td className="px-3 py-2">{triggerWords[r.trigger]}</td>
                    <td className="px-3 py-2">{runStatusWords(r)}</td>
                    <td className="px-3 py-2 text-right tabular-nums">{r.noticesCreated}</td>
                    <td className="px-3 py-2 text-right tabular-nums">{r.emailsSent}</td>
                    <td className="px-3 py-2 text-right tabular-nums">{r.emailsFailed}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        )}
      </section>

      <section aria-labelledby="notices-heading">
        <div className="mb-2 flex flex-wrap items-end justify-between gap-3">
          <h2 id="notices-heading" className="text-sm font-semibold uppercase tracking-wide text-stone-600">Notices</h2>
          <SelectField label="Delivery" wrapperClassName="w-48" value={status} onChange={(e) => setStatus(e.target.value as typeof status)}>
            <option value="">All</option>
            <option value="pending">Pending</option>
            <option value="sent">Sent</option>
            <option value="failed">Failed</option>
            <option value="superseded">No longer applied</option>
          </SelectField>
        </div>
        {notices.isPending ? (
          <LoadingState label="Loading notices…" />
        ) : notices.isError ? (
          <ErrorState error={notices.error} onRetry={() => void notices.refetch()} />
        ) : notices.data.length === 0 ? (
          <EmptyState title="No notices">No notice matches.</EmptyState>
        ) : (
          <Card className="overflow-x-auto">
            <table className="min-w-full text-sm" aria-label="Notices">
              <thead className="bg-stone-50 text-left">
                <tr>
                  <th scope="col" className="px-3 py-2">Welder</th>
                  <th scope="col" className="px-3 py-2">Process · code</th>
                  <th scope="col" className="px-3 py-2">Notice</th>
                  <th scope="col" className="px-3 py-2">Lapses on</th>
                  <th scope="col" className="px-3 py-2">Deliveries</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-stone-100">
                {notices.data.map((n) => (
                  <tr key={n.id}>
                    <td className="px-3 py-2">
                      <span className="font-semibold">{n.welder.stamp}</span> {n.welder.name}
                    </td>
                    <td className="px-3 py-2">
                      {n.process} · {displayName('codes', n.code)}
                    </td>
                    <td className="px-3 py-2">{thresholdWords(n.threshold)}</td>
                    <td className="px-3 py-2 tabular-nums">{n.lapsesOn}</td>
                    <td className="px-3 py-2">
                      <ul>
                        {n.deliveries.map((d) => (
                          <li key={d.userId} className={deliveryTone[d.status]} title={d.lastError ?? d.supersededReason ?? undefined}>
                            {deliveryWords[d.status]} · {d.name} &lt;{d.email}&gt;
                            {d.supersededReason ? ` · ${d.supersededReason}` : ''}
                            {d.attempts > 1 ? ` · ${d.attempts} tries` : ''}
                          </li>
                        ))}
                      </ul>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        )}
      </section>

      <ConfirmDialog
        open={confirming}
        tone="primary"
        title={`Run lapse watch for today, ${today}?`}
        confirmLabel="Run and send"
        busy={run.isPending}
        error={run.error ? errorMessage(run.error) : undefined}
        onCancel={() => {
          setConfirming(false);
          run.reset();
        }}
        onConfirm={() =>
          run.mutate(today, {
            onSuccess: () => setConfirming(false),
          })
        }
      >
        New notices are written and the digest e-mails go out to the foremen and QA managers now. Notices already sent are not sent again.
      </ConfirmDialog>
    </>
  );
}
