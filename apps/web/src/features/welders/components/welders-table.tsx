// The Welders table's columns. Sorting and paging are the server's (manual); the table only shows
// the page it is given and reports which header was clicked.
import type { Welder } from '@beadroll/rules';
import { createColumnHelper, getCoreRowModel, useReactTable, type OnChangeFn, type SortingState } from '@tanstack/react-table';
import { useMemo, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { codeName, lapsedCount, QualificationChips, soonestLapse } from '@/components/ui/qualification-chip';
import { StatusChip } from '@/components/ui/status-chip';
import { paths } from '@/config/paths';

const column = createColumnHelper<Welder>();

interface WeldersTableProps {
  welders: Welder[];
  sorting: SortingState;
  onSortingChange: OnChangeFn<SortingState>;
  onEdit?: (welder: Welder) => void;
  refreshing?: boolean;
  empty?: ReactNode;
}

export function WeldersTable({ welders, sorting, onSortingChange, onEdit, refreshing, empty }: WeldersTableProps) {
  const columns = useMemo(
    () => [
      column.accessor('stamp', {
        header: 'Stamp',
        cell: (info) => (
          <Link to={paths.welder.href(info.row.original.id)} className="tabular-nums font-semibold text-accent-700 hover:underline">
            {info.getValue()}
          </Link>
        ),
        meta: { className: 'w-28' },
      }),
      column.accessor('name', {
        header: 'Name',
        cell: (info) => (
          <Link to={paths.welder.href(info.row.original.id)} className="whitespace-nowrap font-semibold text-stone-900 hover:text-accent-700 hover:underline">
            {info.getValue()}
          </Link>
        ),
      }),
      column.accessor((w) => w.homeShop.name, {
        id: 'homeShop',
        header: 'Home shop',
        cell: (info) => (
          <span className="whitespace-nowrap">
            <span className="tabular-nums text-xs text-stone-500">{info.row.original.homeShop.code}</span>{' '}
            {info.getValue()}
          </span>
        ),
      }),
      column.accessor('email', {
        header: 'E-mail',
        enableSorting: false,
        cell: (info) => info.getValue() || <span className="text-stone-400">none</span>,
      }),
      column.accessor('active', {
        header: 'Status',
        enableSorting: false,
        cell: (info) => <StatusChip status={info.getValue() ? 'welder.active' : 'welder.left'} />,
        meta: { className: 'w-24' },
      }),
      column.display({
        id: 'qualifications',
        header: 'Qualifications',
        cell: (info) => <QualificationChips qualifications={info.row.original.qualifications ?? []} />,
      }),
      column.accessor((w) => soonestLapse(w.qualifications ?? [])?.lapsesOn ?? '', {
        id: 'lapsesOn',
        header: 'Soonest lapse',
        cell: (info) => {
          const qualifications = info.row.original.qualifications ?? [];
          const soonest = soonestLapse(qualifications);
          const lapsed = lapsedCount(qualifications);
          return (
            <span className="flex flex-col gap-0.5">
              {soonest ? (
                <span className="whitespace-nowrap tabular-nums">
                  {soonest.lapsesOn}{' '}
                  <span className="text-xs text-stone-500">
                    ({soonest.process} {codeName(soonest.code)})
                  </span>
                </span>
              ) : (
                <span className="text-stone-400">none ahead</span>
              )}
              {lapsed > 0 && (
                <span className="whitespace-nowrap text-xs font-semibold text-red-700" data-lapsed-count={lapsed}>
                  and {lapsed} lapsed
                </span>
              )}
            </span>
          );
        },
        meta: { className: 'w-44' },
      }),
      ...(onEdit
        ? [
            column.display({
              id: 'actions',
              header: () => <span className="sr-only">Actions</span>,
              cell: (info) => (
                <button
                  type="button"
                  onClick={() => onEdit(info.row.original)}
                  className="min-h-11 rounded px-2 text-sm font-semibold text-accent-700 hover:bg-accent-50 sm:min-h-7"
                  aria-label={`Edit ${info.row.original.stamp}`}
                >
                  Edit
                </button>
              ),
              meta: { className: 'w-16 text-right' },
            }),
          ]
        : []),
    ],
    [onEdit],
  );

  const table = useReactTable({
    data: welders,
    columns,
    state: { sorting },
    onSortingChange,
    manualSorting: true,
    manualPagination: true,
    enableSortingRemoval: false,
    enableMultiSort: false,
    sortDescFirst: false,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (row) => row.id,
  });

  return <DataTable table={table} caption="Welders" refreshing={refreshing} empty={empty} />;
}
