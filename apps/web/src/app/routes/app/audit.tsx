// Audit trail: every create and change on the company's records, newest first. The filter and the
// page sit in the URL, so a view handed to an auditor opens the same way.
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { Pagination } from '@/components/ui/data-table';
import { SelectField } from '@/components/ui/field';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { auditQueries } from '@/features/audit/api/audit-queries';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { AuditTable } from '@/features/audit/components/audit-table';
import { auditEntityTypes, type AuditEntityType } from '@beadroll/rules';

// A label for every kind the API audits: a new kind in the shared list does not type-check until named here.
const recordLabels: Record<AuditEntityType, string> = {
  shop: 'Shops',
  person: 'People',
  welder: 'Welders',
  procedure: 'Procedures (WPS)',
  coupon: 'Coupons',
  qualification: 'Qualifications',
  upload: 'Attached files',
  'verify-token': 'Verify links',
  'continuity-entry': 'Continuity log entries',
  'company-settings': 'Settings',
  'api-token': 'API tokens',
  import: 'Imports',
  'lapse-watch-run': 'Lapse-watch runs by hand',
  weld: 'Production welds',
};
const recordTypes = [
  { value: '', label: 'All records' },
  ...auditEntityTypes.map((value) => ({ value, label: recordLabels[value] })),
];

export default function AuditRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Audit trail">
      <AuditScreen />
    </RequireRole>
  );
}

function AuditScreen() {
  const [params, setParams] = useSearchParams();
  const entityType = recordTypes.some((t) => t.value === params.get('entityType')) ? (params.get('entityType') ?? '') : '';
  const page = Math.max(1, Number.parseInt(params.get('page') ?? '1', 10) || 1);
  const audit = useQuery(auditQueries.list({ entityType: entityType || undefined, page }));
  const shops = useQuery(shopQueries.list());

  const go = (next: { entityType?: string; page?: number }) => {
    const search = new URLSearchParams();
    const type = next.entityType ?? entityType;
    if (type) search.set('entityType', type);
    const p = next.page ?? 1;
    if (p > 1) search.set('page', String(p));
    setParams(search);
  };

  return (
    <>
      <PageHeader title="Audit trail" description="Who changed what and when. Entries are never edited or removed." />
      <div className="mb-3 max-w-xs">
        <SelectField label="Record type" value={entityType} onChange={(e) => go({ entityType: e.target.value })}>
          {recordTypes.map((t) => (
            <option key={t.value} value={t.value}>
              {t.label}
            </option>
          ))}
        </SelectField>
      </div>
      {audit.isPending ? (
        <LoadingState label="Loading the audit trail…" />
      ) : audit.isError ? (
        <ErrorState error={audit.error} onRetry={() => void audit.refetch()} />
      ) : audit.data.total === 0 ? (
        <EmptyState title="Nothing recorded yet">Every change to shops, people and welders will be listed here.</EmptyState>
      ) : (
        <>
          <AuditTable events={audit.data.items} shops={shops.data} />
          <Pagination page={audit.data.page} pageSize={audit.data.pageSize} total={audit.data.total} noun="entries" onPageChange={(p) => go({ page: p })} />
        </>
      )}
    </>
  );
}
