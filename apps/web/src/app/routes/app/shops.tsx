import type { Shop } from '@beadroll/rules';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { ConfirmDialog, Dialog } from '@/components/ui/dialog';
import { PlusIcon } from '@/components/ui/icons';
import { PageHeader } from '@/components/ui/page-header';
import { RequireRole } from '@/components/ui/require-role';
import { StatusChip } from '@/components/ui/status-chip';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { paths } from '@/config/paths';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { useUpdateShop } from '@/features/shops/api/update-shop';
import { ShopForm } from '@/features/shops/components/shop-form';
import { writeWelderSearch } from '@/features/welders/api/welder-search';
import { errorMessage } from '@/lib/api-client';

const column = createColumnHelper<Shop>();
type Action = { kind: 'new' } | { kind: 'edit'; shop: Shop } | { kind: 'toggle'; shop: Shop } | null;

export default function ShopsRoute() {
  return (
    <RequireRole roles={['qa_manager']} title="Shops">
      <ShopsScreen />
    </RequireRole>
  );
}

function ShopsScreen() {
  const shops = useQuery(shopQueries.list());
  const [action, setAction] = useState<Action>(null);
  const toggle = useUpdateShop({
    successMessage: action?.kind === 'toggle' ? `${action.shop.name} ${action.shop.active ? 'deactivated' : 'reactivated'}` : undefined,
  });
  const close = () => {
    setAction(null);
    toggle.reset();
  };

  const columns = useMemo(
    () => [
      column.accessor('code', { header: 'Code', cell: (i) => <span className="tabular-nums font-semibold">{i.getValue()}</span>, meta: { className: 'w-24' } }),
      column.accessor('name', { header: 'Name', cell: (i) => <span className="font-semibold">{i.getValue()}</span> }),
      column.accessor('location', { header: 'Location', cell: (i) => i.getValue() || <span className="text-stone-400">—</span> }),
      column.accessor('welderCount', {
        header: 'Welders',
        cell: (i) => (
          <Link className="text-accent-700 hover:underline" to={paths.welders.href(writeWelderSearch({ shopId: i.row.original.id }).toString())}>
            {i.getValue()}
          </Link>
        ),
        meta: { className: 'w-20 text-right tabular-nums' },
      }),
      column.accessor((s) => s.foremen.map((f) => f.name).join(', '), {
        id: 'foremen',
        header: 'Foremen',
        cell: (i) => i.getValue() || <span className="text-stone-400">none assigned</span>,
      }),
      column.accessor('active', {
        header: 'Status',
        cell: (i) => <StatusChip status={i.getValue() ? 'shop.active' : 'shop.inactive'} />,
        meta: { className: 'w-24' },
      }),
      column.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (i) => {
          const shop = i.row.original;
          return (
            <div className="flex justify-end gap-1">
              <Button variant="ghost" size="row" onClick={() => setAction({ kind: 'edit', shop })} aria-label={`Rename ${shop.name}`}>
                Rename
              </Button>
              <Button variant="ghost" size="row" onClick={() => setAction({ kind: 'toggle', shop })} aria-label={`${shop.active ? 'Deactivate' : 'Reactivate'} ${shop.name}`}>
                {shop.active ? 'Deactivate' : 'Reactivate'}
              </Button>
            </div>
          );
        },
        meta: { className: 'text-right' },
      }),
    ],
    [],
  );
  const table = useReactTable({ data: shops.data ?? [], columns, getCoreRowModel: getCoreRowModel(), getRowId: (s) => s.id, enableSorting: false });

  return (
    <>
      <PageHeader
        title="Shops"
        description="The company's shops and field crews. Welders have a home shop; foremen look after one or more shops."
        actions={
          <Button variant="primary" onClick={() => setAction({ kind: 'new' })}>
            <PlusIcon /> New shop
          </Button>
        }
      />
      {shops.isPending ? (
        <LoadingState label="Loading shops…" />
      ) : shops.isError ? (
        <ErrorState error={shops.error} onRetry={() => void shops.refetch()} />
      ) : shops.data.length === 0 ? (
        <EmptyState
          title="No shops yet"
          action={
            <Button variant="primary" onClick={() => setAction({ kind: 'new' })}>
              <PlusIcon /> Create the first shop
            </Button>
          }
        >
          Each shop gets a short code (for example PV for a vessel bay) that appears beside its welders.
        </EmptyState>
      ) : (
        <DataTable table={table} caption="Shops" />
      )}

      <Dialog
        open={action?.kind === 'new' || action?.kind === 'edit'}
        onClose={close}
        title={action?.kind === 'edit' ? `Rename ${action.shop.name}` : 'New shop'}
      >
        {(action?.kind === 'new' || action?.kind === 'edit') && (
          <ShopForm key={action.kind === 'edit' ? action.shop.id : 'new'} shop={action.kind === 'edit' ? action.shop : undefined} onDone={close} onCancel={close} />
        )}
      </Dialog>

      <ConfirmDialog
        open={action?.kind === 'toggle'}
        title={action?.kind === 'toggle' ? `${action.shop.active ? 'Deactivate' : 'Reactivate'} ${action.shop.name}?` : ''}
        confirmLabel={action?.kind === 'toggle' && !action.shop.active ? 'Reactivate' : 'Deactivate'}
        tone={action?.kind === 'toggle' && !action.shop.active ? 'primary' : 'danger'}
        busy={toggle.isPending}
        error={toggle.error ? errorMessage(toggle.error) : undefined}
        onCancel={close}
        onConfirm={() => {
          if (action?.kind === 'toggle') toggle.mutate({ id: action.shop.id, input: { active: !action.shop.active } }, { onSuccess: close });
        }}
      >
        {action?.kind === 'toggle' && action.shop.active
          ? `${action.shop.name} will be marked inactive. Its ${action.shop.welderCount} welders and their history stay as they are; you can reactivate the shop later.`
          : 'The shop becomes active again.'}
      </ConfirmDialog>
    </>
  );
}
