// The Welders screen: one server-side page of the company's (or the foreman's shops') welders, sorted and
// filtered on the server. Everything that decides the view sits in the URL so it can be bookmarked.
import { welderSortKeys, type Welder } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import type { SortingState, Updater } from '@tanstack/react-table';
import { useEffect, useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Pagination } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { SelectField, TextField } from '@/components/ui/field';
import { PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { welderQueries } from '@/features/welders/api/welder-queries';
import { readWelderSearch, writeWelderSearch, type WelderFilters, type WelderSortKey } from '@/features/welders/api/welder-search';
import { WelderForm } from '@/features/welders/components/welder-form';
import { WeldersTable } from '@/features/welders/components/welders-table';
import { useUser } from '@/lib/auth';

const isSortKey = (id: string): id is WelderSortKey => (welderSortKeys as readonly string[]).includes(id);

function useWelderSearch() {
  const [params, setParams] = useSearchParams();
  const filters = readWelderSearch(params);
  const update = (changes: Partial<WelderFilters>, { resetPage = true } = {}) => {
    const next = { ...filters, ...(resetPage ? { page: 1 } : {}), ...changes };
    setParams(writeWelderSearch(next), { replace: 'q' in changes });
  };
  return { filters, update };
}

export default function WeldersRoute() {
  const me = useUser();
  return (
    <RequireRole
      roles={['qa_manager', 'foreman']}
      title="Welders"
      message="The Welders list is for QA managers and foremen. Your own record is in your welder file."
    >
      <WeldersScreen canEdit={me.role === 'qa_manager'} />
    </RequireRole>
  );
}

function WeldersScreen({ canEdit }: { canEdit: boolean }) {
  const navigate = useNavigate();
  const { filters, update } = useWelderSearch();
  const shops = useQuery(shopQueries.list());
  const list = useQuery(welderQueries.list(filters));
  const [editing, setEditing] = useState<Welder | 'new' | null>(null);

  // The search box answers as one types, but only asks the server once typing pauses.
  const [text, setText] = useState(filters.q ?? '');
  useEffect(() => setText(filters.q ?? ''), [filters.q]);
  useEffect(() => {
    const q = text.trim();
    if (q === (filters.q ?? '')) return;
    const timer = setTimeout(() => update({ q: q || undefined }), 300);
    return () => clearTimeout(timer);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only a change of the typed text schedules a search
  }, [text]);

  const sorting: SortingState = [{ id: filters.sort, desc: filters.dir === 'desc' }];
  const onSortingChange = (updater: Updater<SortingState>) => {
    const next = typeof updater === 'function' ? updater(sorting) : updater;
    const first = next[0];
    if (first && isSortKey(first.id)) update({ sort: first.id, dir: first.desc ? 'desc' : 'asc' });
  };

  const filtered = Boolean(filters.q || filters.shopId || filters.state || filters.status !== 'active');
  const activeShops = (shops.data ?? []).filter((s) => s.active || s.id === filters.shopId);
  const page = list.data;

  return (
    <>
      <PageHeader
        title="Welders"
        description="Every welder by stamp, with home shop and contact. Open a welder to see the file."
        actions={
          canEdit && (
            <Button variant="primary" onClick={() => setEditing('new')} disabled={!shops.data}>
              <PlusIcon /> Add welder
            </Button>
          )
        }
      />

      <div role="search" className="mb-3 grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_minmax(0,1fr)] lg:max-w-5xl">
        <TextField
          label="Search welders"
          type="search"
          placeholder="Stamp or name"
          value={text}
          onChange={(e) => setText(e.target.value)}
          onKeyDown={(e) => {
            if (e.key === 'Enter') update({ q: text.trim() || undefined });
          }}
          autoComplete="off"
        />
        <SelectField label="Shop" value={filters.shopId ?? ''} onChange={(e) => update({ shopId: e.target.value || undefined })}>
          <option value="">All shops</option>
          {activeShops.map((shop) => (
            <option key={shop.id} value={shop.id}>
              {shop.code} · {shop.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Status" value={filters.state ?? ''} onChange={(e) => update({ state: (e.target.value || undefined) as WelderFilters['state'] })}>
          <option value="">Any status</option>
          <option value="current">Current</option>
          <option value="lapsing">Lapsing</option>
          <option value="lapsed">Lapsed</option>
          <option value="revoked">Revoked</option>
        </SelectField>
        <SelectField
          label="Show"
          value={filters.status}
          onChange={(e) => update({ status: e.target.value as WelderFilters['status'] })}
        >
          <option value="active">Active welders</option>
          <option value="left">Left the company</option>
          <option value="all">Everyone</option>
        </SelectField>
      </div>

      {list.isPending ? (
        <LoadingState label="Loading welders…" />
      ) : list.isError && !page ? (
        <ErrorState error={list.error} onRetry={() => void list.refetch()} />
      ) : page && page.total === 0 && !filtered ? (
        <EmptyState
          title="No welders yet"
          action={
            canEdit && (
              <Button variant="primary" onClick={() => setEditing('new')} disabled={!shops.data}>
                <PlusIcon /> Add the first welder
              </Button>
            )
          }
        >
          {canEdit ? 'Add each welder with their stamp and home shop.' : 'No welder has a home shop among your shops yet.'}
        </EmptyState>
      ) : (
        <>
          <WeldersTable
            welders={page?.items ?? []}
            sorting={sorting}
            onSortingChange={onSortingChange}
            onEdit={canEdit ? (w) => setEditing(w) : undefined}
            refreshing={list.isPlaceholderData}
            empty={
              <span>
                No welder matches these filters.{' '}
                <button type="button" className="font-semibold text-accent-700 underline" onClick={() => void navigate(paths.welders.href())}>
                  Clear the filters
                </button>
              </span>
            }
          />
          {page && (
            <Pagination
              page={page.page}
              pageSize={page.pageSize}
              total={page.total}
              noun={page.total === 1 ? 'welder' : 'welders'}
              onPageChange={(p) => update({ page: p }, { resetPage: false })}
              onPageSizeChange={(n) => update({ pageSize: n })}
            />
          )}
        </>
      )}

      <Dialog
        open={editing !== null}
        onClose={() => setEditing(null)}
        title={editing === 'new' ? 'Add a welder' : editing ? `Edit ${editing.stamp} · ${editing.name}` : ''}
        size="lg"
      >
        {editing !== null && (
          <WelderForm
            key={editing === 'new' ? 'new' : editing.id}
            welder={editing === 'new' ? undefined : editing}
            shops={activeShops}
            onCancel={() => setEditing(null)}
            onDone={(welder) => {
              setEditing(null);
              if (editing === 'new') void navigate(paths.welder.href(welder.id));
            }}
          />
        )}
      </Dialog>
    </>
  );
}
