import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Card, PageHeader } from '@/components/ui/page-header';
import { StatusChip } from '@/components/ui/status-chip';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { writeWelderSearch } from '@/features/welders/api/welder-search';
import { useUser } from '@/lib/auth';

export default function OverviewRoute() {
  const me = useUser();
  const shops = useQuery(shopQueries.list());
  const shown = shops.data?.filter((s) => s.active) ?? [];
  const total = shown.reduce((sum, s) => sum + s.welderCount, 0);

  return (
    <>
      <PageHeader
        title="Overview"
        description={
          me.role === 'qa_manager'
            ? `Welcome, ${me.name}. Every shop of ${me.organization.name} at a glance.`
            : `Welcome, ${me.name}. The shops you look after.`
        }
      />
      {shops.isPending ? (
        <LoadingState label="Loading shops…" />
      ) : shops.isError ? (
        <ErrorState error={shops.error} onRetry={() => void shops.refetch()} />
      ) : shown.length === 0 ? (
        <EmptyState title="No shops yet">
          {me.role === 'qa_manager' ? (
            <>
              Start by creating the company&apos;s shops on the <Link className="font-semibold text-accent-700 underline" to={paths.shops.href()}>Shops</Link> screen.
            </>
          ) : (
            'You are not assigned to a shop yet. Ask your QA manager to assign you.'
          )}
        </EmptyState>
      ) : (
        <>
          <h2 className="mb-2 text-sm font-semibold uppercase tracking-wide text-stone-600">Welders per shop</h2>
          <ul className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
            {shown.map((shop) => (
              <li key={shop.id}>
                <Link
                  to={paths.welders.href(writeWelderSearch({ shopId: shop.id }).toString())}
                  className="block rounded-lg border border-stone-200 bg-white p-4 shadow-sm transition hover:border-accent-500 hover:shadow"
                >
                  <div className="flex items-center justify-between gap-2">
                    <span className="tabular-nums text-xs font-semibold text-stone-500">{shop.code}</span>
                    <StatusChip status="shop.active" />
                  </div>
                  <p className="mt-1 font-semibold text-stone-900">{shop.name}</p>
                  {shop.location && <p className="text-sm text-stone-500">{shop.location}</p>}
                  <p className="mt-3 text-3xl font-bold text-accent-700">
                    {shop.welderCount}
                    <span className="ml-1.5 text-sm font-semibold text-stone-600">{shop.welderCount === 1 ? 'welder' : 'welders'}</span>
                  </p>
                </Link>
              </li>
            ))}
          </ul>
          <p className="mt-3 text-sm text-stone-600">
            {total} {total === 1 ? 'welder' : 'welders'} in {shown.length} {shown.length === 1 ? 'shop' : 'shops'}.
          </p>
          <Card className="mt-6 p-4 text-sm text-stone-600">
            Continuity, lapse warnings and qualification counts will appear here as the qualification records arrive.
          </Card>
        </>
      )}
    </>
  );
}
