// The public Verify page an inspector reaches from the QR code on a wallet card: no sign-in, no shell.
// Name, stamp, company, today's date and each qualification's state, nothing more.
import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { BeadIcon } from '@/components/ui/icons';
import { SafetyNotice } from '@/components/ui/safety-notice';
import { StatusChip } from '@/components/ui/status-chip';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { verifyQueries } from '@/features/verify/api/verify-queries';
import { ApiError } from '@/lib/api-client';
import { codeNames } from '@/lib/codes';
import { formatDay } from '@beadroll/rules';

function Problem({ error, onRetry }: { error: unknown; onRetry: () => void }) {
  // A link never issued (mistyped, cut short) is not a revoked card: the inspector is told which.
  if (error instanceof ApiError && error.status === 404)
    return (
      <div role="alert" className="rounded-lg border border-amber-200 bg-amber-50 px-4 py-6 text-amber-900">
        <p className="text-lg font-bold">No card was found for this link</p>
        <p className="mt-1 text-sm">Check that the whole address was scanned or typed. If it still fails, ask the welder&apos;s employer.</p>
      </div>
    );
  if (error instanceof ApiError && error.status === 410)
    return (
      <div role="alert" className="rounded-lg border border-red-200 bg-red-50 px-4 py-6 text-red-900">
        <p className="text-lg font-bold">This card is no longer valid</p>
        <p className="mt-1 text-sm">The link was revoked or replaced by a newer card. Ask the welder&apos;s employer for a current card.</p>
      </div>
    );
  if (error instanceof ApiError && error.status === 429)
    return (
      <div role="alert" className="rounded-lg border border-amber-200 bg-amber-50 px-4 py-6 text-amber-900">
        <p className="font-bold">Too many checks from this address; try again in a minute</p>
      </div>
    );
  return <ErrorState error={error} onRetry={onRetry} />;
}

export default function VerifyRoute() {
  const { token = '' } = useParams();
  const view = useQuery(verifyQueries.view(token));
  return (
    <div className="min-h-dvh bg-stone-50">
      <main className="mx-auto max-w-xl px-4 py-6">
        <p className="mb-4 flex items-center gap-2 text-lg font-bold text-stone-900">
          <span className="grid size-8 place-items-center rounded-md bg-accent-600 text-white">
            <BeadIcon className="size-5" />
          </span>
          Beadroll · Verify a welder
        </p>
        {view.isPending ? (
          <LoadingState label="Checking the card…" />
        ) : view.isError ? (
          <Problem error={view.error} onRetry={() => void view.refetch()} />
        ) : (
          <section aria-label="Welder" className="rounded-lg border border-stone-200 bg-white p-5 shadow-sm">
            <h1 className="text-2xl font-bold">{view.data.welder.name}</h1>
            <p className="mt-1 text-stone-700">
              Stamp <strong className="tabular-nums">{view.data.welder.stamp}</strong> · {view.data.company}
            </p>
            <p className="mt-1 text-sm text-stone-600">Status as of {formatDay(view.data.asOf, 'long')}</p>
            {view.data.leftOn !== null ? (
              <div role="alert" className="mt-4 rounded-md border border-red-200 bg-red-50 px-3 py-3 text-red-900">
                <p className="font-bold">No longer with the company</p>
                <p className="mt-1 text-sm">
                  {view.data.welder.name} left {view.data.company} on {formatDay(view.data.leftOn, 'long')}. This card is not valid for work; ask the welder&apos;s current employer.
                </p>
              </div>
            ) : view.data.qualifications.length === 0 ? (
              <p className="mt-4 rounded-md bg-stone-100 px-3 py-3 text-stone-800">No qualification in force is on record for this welder.</p>
            ) : (
              <ul className="mt-4 divide-y divide-stone-100">
                {view.data.qualifications.map((q, i) => (
                  <li key={i} className="py-3">
                    <div className="flex flex-wrap items-center gap-2">
                      <span className="font-semibold">
                        {codeNames[q.code]} · {q.process}
                      </span>
                      <StatusChip status={`qualification.${q.state}`} />
                    </div>
                    <p className="mt-1 text-sm text-stone-700">{q.summary}</p>
                    <p className="text-xs text-stone-600">
                      {q.state === 'lapsed' || q.state === 'revoked' ? `Not in force since ${formatDay(q.lapsesOn, 'long')}` : `Lapses on ${formatDay(q.lapsesOn, 'long')} unless continued by documented use`}
                    </p>
                  </li>
                ))}
              </ul>
            )}
            <p className="mt-4 text-sm text-stone-700">{view.data.notice}</p>
          </section>
        )}
        <SafetyNotice className="mt-4" />
      </main>
    </div>
  );
}
