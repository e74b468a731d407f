// Record a coupon: reachable from Coupons, from a welder file (welder preselected) and from a failed
// coupon as a retest (the failed coupon named; welder, code, process, position and form taken from it).
import { useQuery } from '@tanstack/react-query';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { ChevronLeftIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { couponQueries } from '@/features/coupons/api/coupon-queries';
import { CouponForm } from '@/features/coupons/components/coupon-form';
import { procedureQueries } from '@/features/procedures/api/procedure-queries';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { welderQueries } from '@/features/welders/api/welder-queries';

function NewCouponScreen() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const welders = useQuery(welderQueries.list({ status: 'active', sort: 'stamp', dir: 'asc', page: 1, pageSize: 200 }));
  const shops = useQuery(shopQueries.list());
  const procedures = useQuery(procedureQueries.list({ status: 'active' }));
  // A retest names the failed coupon (the coupon page's "Record a retest"): its welder, code, process,
  // position and form are the retest's.
  const retestOfId = params.get('retestOf') ?? '';
  const failedCoupon = useQuery({ ...couponQueries.detail(retestOfId), enabled: retestOfId !== '' });
  const retestOf = retestOfId !== '' ? failedCoupon.data : undefined;
  const prefill = {
    welderId: retestOf?.welder.id ?? params.get('welderId') ?? undefined,
    code: params.get('code') ?? undefined,
    process: params.get('process') ?? undefined,
    position: params.get('position') ?? undefined,
    form: params.get('form') ?? undefined,
    ...(retestOf ? { retestOf } : {}),
  };
  const retest = retestOfId !== '' || params.get('retest') === '1';
  const back = retestOfId ? paths.coupon.href(retestOfId) : prefill.welderId ? paths.welder.href(prefill.welderId) : paths.coupons.href();

  const failed = [welders, shops, procedures, ...(retestOfId ? [failedCoupon] : [])].find((q) => q.isError);
  return (
    <>
      <Link to={back} className="mb-2 inline-flex min-h-11 items-center gap-1 text-sm font-semibold text-accent-700 hover:underline sm:min-h-0">
        <ChevronLeftIcon /> {retestOfId ? 'Failed coupon' : prefill.welderId ? 'Welder file' : 'Coupons'}
      </Link>
      <PageHeader
        title={retest ? 'Record a retest' : 'Record a coupon'}
        description="The test, the coupon and its examination. The evaluation and the ranges update as you type."
      />
      {failed?.error ? (
        <ErrorState error={failed.error} onRetry={() => void failed.refetch()} />
      ) : !welders.data || !shops.data || !procedures.data || (retestOfId !== '' && !retestOf) ? (
        <LoadingState label="Loading welders, shops and procedures…" />
      ) : (
        <CouponForm
          welders={welders.data.items}
          shops={shops.data.filter((s) => s.active)}
          procedures={procedures.data.items}
          prefill={prefill}
          onCancel={() => void navigate(back)}
          onSaved={(coupon) => void navigate(paths.coupon.href(coupon.id))}
        />
      )}
    </>
  );
}

export default function NewCouponRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Record a coupon" message="Only the QA manager records qualification tests.">
      <NewCouponScreen />
    </RequireRole>
  );
}
