// My qualifications (the welder): what each qualification lets me weld, whether it is in force, the
// days left, my WPQ PDFs and my wallet card, and who to ask about it.
import { useQuery } from '@tanstack/react-query';
import { lazy, Suspense } from 'react';
import { Link } from 'react-router-dom';
import { buttonClasses } from '@/components/ui/button';
import { Card, PageHeader } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { qualificationQueries, walletCardUrl } from '@/features/qualifications/api/qualification-queries';
import { useUser } from '@/lib/auth';

// The cards (with the ranges view) load while the list is fetched, so the page paints without them.
// Requested as soon as this screen's code runs, in parallel with the list, without holding up the paint.
const cardModule = import('@/features/qualifications/components/qualification-card');
const QualificationCard = lazy(() => cardModule.then((m) => ({ default: m.QualificationCard })));
// Below the qualification cards: loaded after the page has painted.
const ContinuitySummary = lazy(() =>
  import('@/features/continuity/components/continuity-timeline').then((m) => ({ default: m.ContinuitySummary })),
);

export default function MyQualificationsRoute() {
  const me = useUser();
  const list = useQuery({ ...qualificationQueries.list(me.welderId ? { welderId: me.welderId } : {}), enabled: me.welderId !== null });
  return (
    <>
      <PageHeader
        title="My qualifications"
        description={`Signed in as ${me.name}.`}
        actions={
          me.welderId &&
          // a wallet card vouches for today: none is issued when no qualification is current or lapsing
          (list.data?.items ?? []).some((q) => q.status.state === 'current' || q.status.state === 'lapsing') && (
            <a className={buttonClasses('secondary')} href={walletCardUrl(me.welderId)} download>
              Download my wallet card (PDF)
            </a>
          )
        }
      />
      {!me.welderId ? (
        <Card className="p-5">
          <p className="text-stone-700">Your sign-in is not linked to a welder record yet. Ask your QA manager.</p>
        </Card>
      ) : list.isPending ? (
        <LoadingState label="Loading your qualifications…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : list.data.items.length === 0 ? (
        <Card className="p-5">
          <p className="text-stone-800">You have no certified qualification on record yet. Your QA manager records your tests and certifies them.</p>
        </Card>
      ) : (
        <Suspense fallback={<LoadingState label="Loading your qualifications…" />}>
          <div className="space-y-3">
            {list.data.items.map((q) => (
              <QualificationCard key={q.id} qualification={q} />
            ))}
          </div>
        </Suspense>
      )}
      {me.welderId && (
        <section aria-labelledby="continuity-heading" className="mt-5">
          <h2 id="continuity-heading" className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">
            Continuity: days left and last logged use
          </h2>
          <Suspense fallback={<LoadingState label="Loading your continuity…" />}>
            <ContinuitySummary welderId={me.welderId} />
          </Suspense>
        </section>
      )}
      <Card className="mt-4 p-4">
        <h2 className="font-bold">Questions about a qualification?</h2>
        <p className="mt-1 text-sm text-stone-700">
          Ask your QA manager: they record your tests, certify your qualifications and can correct a record. A qualification stays in
          force only while you keep using the process; your foreman logs that use.
        </p>
        {me.welderId && (
          <p className="mt-2 text-sm">
            <Link to={paths.welder.href(me.welderId)} className="font-semibold text-accent-700 underline">
              Open your welder file
            </Link>{' '}
            <span className="text-stone-600">for your coupons, stamp and home shop.</span>
          </p>
        )}
      </Card>
    </>
  );
}
