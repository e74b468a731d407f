// Coupons: every qualification test recorded, newest first, with its verdict; filter by result.
import { examinationResults } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { SelectField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { couponQueries, type CouponFilters } from '@/features/coupons/api/coupon-queries';
import { CouponsTable } from '@/features/coupons/components/coupons-table';

const resultWords = { accept: 'Accepted', reject: 'Rejected', 'replace-specimen': 'Replace a specimen' } as const;

function CouponsScreen() {
  const [params, setParams] = useSearchParams();
  const raw = params.get('result');
  const result = (examinationResults as readonly string[]).includes(raw ?? '') ? (raw as CouponFilters['result']) : undefined;
  const list = useQuery(couponQueries.list({ result }));
  return (
    <>
      <PageHeader
        title="Coupons"
        description="Qualification tests as recorded, with the verdict Beadroll stored for each."
        actions={
          <ButtonLink variant="primary" to={paths.couponNew.href()}>
            <PlusIcon /> Record a coupon
          </ButtonLink>
        }
      />
      <div className="mb-3 max-w-xs">
        <SelectField label="Result" value={result ?? ''} onChange={(e) => setParams(e.target.value ? { result: e.target.value } : {}, { replace: true })}>
          <option value="">All results</option>
          {examinationResults.map((r) => (
            <option key={r} value={r}>
              {resultWords[r]}
            </option>
          ))}
        </SelectField>
      </div>
      {list.isPending ? (
        <LoadingState label="Loading coupons…" />
      ) : list.isError ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : list.data.items.length === 0 && !result ? (
        <EmptyState
          title="No coupons yet"
          action={
            <ButtonLink variant="primary" to={paths.couponNew.href()}>
              <PlusIcon /> Record the first coupon
            </ButtonLink>
          }
        >
          Record each welder&apos;s qualification test and its examination; Beadroll evaluates the bend specimens as you type.
        </EmptyState>
      ) : (
        <CouponsTable coupons={list.data.items} empty="No coupon has this result." />
      )}
    </>
  );
}

export default function CouponsRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Coupons" message="Coupons are recorded by the QA manager. Your qualifications are in the welder files.">
      <CouponsScreen />
    </RequireRole>
  );
}
