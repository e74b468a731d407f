// Overview (QA manager: every shop; foreman: their shops): qualification statuses per shop, lapses due
// in the next 90 days by week, the review queue of use logged while lapsed, and the latest lapse-watch run.
import { useQuery } from '@tanstack/react-query';
import { lazy, Suspense } from 'react';
import { Link } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { AlertIcon } from '@/components/ui/icons';
import { Card, PageHeader } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { RunSummary } from '@/features/lapse-watch/components/run-summary';
import { overviewQueries } from '@/features/overview/api/overview-queries';
import { LapsesChart } from '@/features/overview/components/lapses-chart';
import { writeWelderSearch } from '@/features/welders/api/welder-search';
import { useUser } from '@/lib/auth';

const states = ['current', 'lapsing', 'lapsed', 'revoked'] as const;

// Below the fold and for the QA manager only: loaded after the page has painted.
const ReviewList = lazy(() => import('@/features/continuity/components/review-list'));

export default function OverviewRoute() {
  const me = useUser();
  const overview = useQuery(overviewQueries.summary());
  const isQa = me.role === 'qa_manager';

  return (
    <>
      <PageHeader
        title="Overview"
        description={
          isQa
            ? `Welcome, ${me.name}. Every shop of ${me.organization.name} at a glance.`
            : `Welcome, ${me.name}. The shops you look after.`
        }
      />
      {overview.isPending ? (
        <LoadingState label="Loading the overview…" />
      ) : overview.isError ? (
        <ErrorState error={overview.error} onRetry={() => void overview.refetch()} />
      ) : overview.data.counts.length === 0 ? (
        <EmptyState title="No shops yet">
          {isQa ? (
            <>
              Start by creating the company&apos;s shops on the{' '}
              <Link className="font-semibold text-accent-700 underline" to={paths.shops.href()}>
                Shops
              </Link>{' '}
              screen.
            </>
          ) : (
            'You are not assigned to a shop yet. Ask your QA manager to assign you.'
          )}
        </EmptyState>
      ) : (
        <div className="space-y-5">
          {overview.data.failedDeliveries > 0 && (
            <p role="alert" className="flex items-start gap-2 rounded-md border border-red-200 bg-red-50 px-3 py-2 text-sm text-red-800">
              <AlertIcon className="mt-0.5 size-4 shrink-0" />
              <span>
                {overview.data.failedDeliveries} lapse warning {overview.data.failedDeliveries === 1 ? 'e-mail' : 'e-mails'} could not be
                delivered after repeated tries.{' '}
                {isQa && (
                  <Link className="font-semibold underline" to={paths.lapseWatch.href()}>
                    See them in Lapse watch
                  </Link>
                )}
              </span>
            </p>
          )}
          <section aria-labelledby="counts-heading">
            <h2 id="counts-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
              Qualifications by status, as of {overview.data.asOf}
            </h2>
            <Card className="overflow-x-auto">
              <table className="min-w-full text-sm">
                <thead className="bg-stone-50">
                  <tr>
                    <th scope="col" className="px-3 py-2 text-left">Shop</th>
                    {states.map((s) => (
                      <th key={s} scope="col" className="px-3 py-2 text-right">
                        <StatusChip status={`qualification.${s}`} />
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody className="divide-y divide-stone-100">
                  {overview.data.counts.map((row) => (
                    <tr key={row.shop.id}>
                      <th scope="row" className="px-3 py-2 text-left font-semibold">
                        <span className="tabular-nums text-xs text-stone-500">{row.shop.code}</span> {row.shop.name}
                      </th>
                      {states.map((s) => (
                        <td key={s} className="px-3 py-2 text-right tabular-nums">
                          {row[s] > 0 ? (
                            <Link
                              className="inline-flex min-h-11 items-center justify-end font-semibold text-accent-700 hover:underline sm:min-h-0"
                              to={paths.welders.href(writeWelderSearch({ shopId: row.shop.id, state: s }).toString())}
                              aria-label={`${row[s]} ${s} in ${row.shop.name}`}
                            >
                              {row[s]}
                            </Link>
                          ) : (
                            <span className="text-stone-400">0</span>
                          )}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </Card>
          </section>
          <div className="grid gap-5 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
            <section aria-labelledby="chart-heading">
              <h2 id="chart-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
                Lapses due in the next 90 days, by week
              </h2>
              <Card className="p-4">
                <LapsesChart weeks={overview.data.lapsesByWeek} />
              </Card>
            </section>
            <div className="space-y-5">
              <section aria-labelledby="review-heading">
                <h2 id="review-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
                  Review queue
                </h2>
                <Card className="p-4">
                  <p className="text-3xl font-bold text-accent-700">
                    {overview.data.reviewQueue}
                    <span className="ml-1.5 text-sm font-semibold text-stone-600">
                      {overview.data.reviewQueue === 1 ? 'entry' : 'entries'} logged while lapsed
                    </span>
                  </p>
                  <p className="mt-1 text-sm text-stone-600">Use logged after a qualification lapsed is not evidence; the welds may need disposition.</p>
                  {isQa && overview.data.reviewQueue > 0 && (
                    <a className="mt-2 inline-flex min-h-11 items-center font-semibold text-accent-700 underline sm:min-h-0" href="#review-list">
                      Open the review list
                    </a>
                  )}
                </Card>
              </section>
              <section aria-labelledby="run-heading">
                <h2 id="run-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
                  Latest lapse watch
                </h2>
                <Card className="p-4 text-sm">
                  <RunSummary run={overview.data.latestRun} timeZone={me.timeZone} />
                  {isQa && (
                    <ButtonLink className="mt-3" to={paths.lapseWatch.href()}>
                      Open Lapse watch
                    </ButtonLink>
                  )}
                </Card>
              </section>
            </div>
          </div>
          {isQa && (
            <Suspense fallback={<LoadingState label="Loading the review queue…" />}>
              <ReviewList />
            </Suspense>
          )}
        </div>
      )}
    </>
  );
}
