// People: everyone with a Beadroll sign-in, their role, shops and whether they can sign in.
import type { Person } from '@beadroll/rules';
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
import { peopleQueries } from '@/features/people/api/people-queries';
import { useResendInvitation } from '@/features/people/api/resend-invitation';
import { useUpdatePerson } from '@/features/people/api/update-person';
import { InvitePersonForm } from '@/features/people/components/invite-person-form';
import { ShopAssignmentForm } from '@/features/people/components/shop-assignment-form';
import { shopQueries } from '@/features/shops/api/shop-queries';
import { welderQueries } from '@/features/welders/api/welder-queries';
import { defaultWelderFilters } from '@/features/welders/api/welder-search';
import { errorMessage } from '@/lib/api-client';
import { roleLabels, useUser } from '@/lib/auth';
import { formatInstant } from '@beadroll/rules';

const column = createColumnHelper<Person>();
type Action =
  | { kind: 'invite' }
  | { kind: 'shops'; person: Person }
  | { kind: 'deactivate'; person: Person }
  | { kind: 'reactivate'; person: Person }
  | null;

function lastSignIn(iso: string | null, timeZone: string): string {
  if (!iso) return 'never';
  return formatInstant(iso, timeZone);
}

export default function PeopleRoute() {
  const me = useUser();
  return (
    <RequireRole roles={['qa_manager']} title="People">
      <PeopleScreen myId={me.id} timeZone={me.timeZone} />
    </RequireRole>
  );
}

function PeopleScreen({ myId, timeZone }: { myId: string; timeZone: string }) {
  const people = useQuery(peopleQueries.list());
  const shops = useQuery(shopQueries.list());
  const [action, setAction] = useState<Action>(null);
  const welders = useQuery({
    ...welderQueries.list({ ...defaultWelderFilters, pageSize: 200, sort: 'stamp' }),
    enabled: action?.kind === 'invite',
  });
  const resend = useResendInvitation();
  const setActive = useUpdatePerson({
    successMessage: action?.kind === 'deactivate' ? `${action.person.name} can no longer sign in` : action?.kind === 'reactivate' ? `${action.person.name} can sign in again` : undefined,
  });
  const close = () => {
    setAction(null);
    setActive.reset();
  };
  const activeShops = (shops.data ?? []).filter((s) => s.active);

  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Name',
        cell: (i) => (
          <span className="font-semibold">
            {i.getValue()}
            {i.row.original.id === myId && <span className="ml-1.5 text-xs font-normal text-stone-500">(you)</span>}
          </span>
        ),
      }),
      column.accessor('email', { header: 'E-mail' }),
      column.accessor('role', { header: 'Role', cell: (i) => roleLabels[i.getValue()] }),
      column.display({
        id: 'scope',
        header: 'Shops',
        cell: (i) => {
          const p = i.row.original;
          if (p.role === 'qa_manager') return <span className="text-stone-500">All shops</span>;
          if (p.role === 'welder')
            return p.welderId ? (
              <Link className="text-accent-700 hover:underline" to={paths.welder.href(p.welderId)}>
                Welder file
              </Link>
            ) : (
              '—'
            );
          return p.shops.map((s) => s.code).join(', ') || <span className="text-amber-800">none</span>;
        },
      }),
      column.accessor('status', { header: 'Status', cell: (i) => <StatusChip status={`person.${i.getValue()}`} />, meta: { className: 'w-28' } }),
      column.accessor('lastSignInAt', { header: 'Last sign-in', cell: (i) => <span className="whitespace-nowrap text-stone-600">{lastSignIn(i.getValue(), timeZone)}</span> }),
      column.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (i) => {
          const p = i.row.original;
          return (
            <div className="flex flex-wrap justify-end gap-1">
              {p.role === 'foreman' && p.status !== 'deactivated' && (
                <Button variant="ghost" size="row" onClick={() => setAction({ kind: 'shops', person: p })} aria-label={`Change shops of ${p.name}`}>
                  Shops…
                </Button>
              )}
              {p.status === 'invited' && (
                <Button
                  variant="ghost"
                  size="row"
                  busy={resend.isPending && resend.variables === p.id}
                  onClick={() => resend.mutate(p.id)}
                  aria-label={`Re-send invitation to ${p.name}`}
                >
                  Re-send invitation
                </Button>
              )}
              {p.id !== myId && p.status !== 'deactivated' && (
                <Button variant="ghost" size="row" onClick={() => setAction({ kind: 'deactivate', person: p })} aria-label={`Deactivate ${p.name}`}>
                  Deactivate
                </Button>
              )}
              {p.status === 'deactivated' && (
                <Button variant="ghost" size="row" onClick={() => setAction({ kind: 'reactivate', person: p })} aria-label={`Reactivate ${p.name}`}>
                  Reactivate
                </Button>
              )}
            </div>
          );
        },
        meta: { className: 'text-right' },
      }),
    ],
    [myId, resend, timeZone],
  );
  const table = useReactTable({ data: people.data ?? [], columns, getCoreRowModel: getCoreRowModel(), getRowId: (p) => p.id, enableSorting: false });

  const confirmPerson = action?.kind === 'deactivate' || action?.kind === 'reactivate' ? action.person : null;

  return (
    <>
      <PageHeader
        title="People"
        description="Who can sign in to Beadroll, in which role, for which shops."
        actions={
          <Button variant="primary" onClick={() => setAction({ kind: 'invite' })} disabled={!shops.data}>
            <PlusIcon /> Invite person
          </Button>
        }
      />
      {people.isPending ? (
        <LoadingState label="Loading people…" />
      ) : people.isError ? (
        <ErrorState error={people.error} onRetry={() => void people.refetch()} />
      ) : people.data.length === 0 ? (
        <EmptyState title="No one here yet">Invite the foremen and welders who should sign in.</EmptyState>
      ) : (
        <DataTable table={table} caption="People" />
      )}

      <Dialog open={action?.kind === 'invite'} onClose={close} title="Invite a person" description="They get an e-mail with a link to choose a password; the link works for 7 days." size="lg">
        {action?.kind === 'invite' &&
          (welders.isPending ? (
            <LoadingState label="Loading welders…" />
          ) : welders.isError ? (
            <ErrorState error={welders.error} onRetry={() => void welders.refetch()} />
          ) : (
            <InvitePersonForm shops={activeShops} welders={welders.data.items.filter((w) => !w.hasAccount)} onDone={close} onCancel={close} />
          ))}
      </Dialog>

      <Dialog open={action?.kind === 'shops'} onClose={close} title={action?.kind === 'shops' ? `Shops of ${action.person.name}` : ''}>
        {action?.kind === 'shops' && <ShopAssignmentForm person={action.person} shops={activeShops} onDone={close} onCancel={close} />}
      </Dialog>

      <ConfirmDialog
        open={confirmPerson !== null}
        title={confirmPerson ? `${action?.kind === 'deactivate' ? 'Deactivate' : 'Reactivate'} ${confirmPerson.name}?` : ''}
        confirmLabel={action?.kind === 'deactivate' ? 'Deactivate' : 'Reactivate'}
        tone={action?.kind === 'deactivate' ? 'danger' : 'primary'}
        busy={setActive.isPending}
        error={setActive.error ? errorMessage(setActive.error) : undefined}
        onCancel={close}
        onConfirm={() => {
          if (confirmPerson) setActive.mutate({ id: confirmPerson.id, input: { active: action?.kind !== 'deactivate' } }, { onSuccess: close });
        }}
      >
        {action?.kind === 'deactivate'
          ? `${confirmPerson?.name ?? ''} will no longer be able to sign in. Their records and the audit trail are kept.`
          : `${confirmPerson?.name ?? ''} will be able to sign in again with their password.`}
      </ConfirmDialog>
    </>
  );
}
