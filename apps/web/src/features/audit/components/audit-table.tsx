import type { AuditEvent, ShopRef } from '@beadroll/rules';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo } from 'react';
import { Link } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { paths } from '@/config/paths';
import { actionLabel, describeChanges } from './audit-changes';

const column = createColumnHelper<AuditEvent>();

function when(iso: string): string {
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? iso : date.toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'short' });
}

function Changes({ event, names }: { event: AuditEvent; names: ReadonlyMap<string, string> }) {
  const changes = describeChanges(event.before, event.after, names);
  if (event.before === null && event.after !== null) return <span className="text-stone-600">Created</span>;
  if (changes.length === 0) return <span className="text-stone-400">—</span>;
  return (
    <ul className="space-y-0.5">
      {changes.slice(0, 6).map((c) => (
        <li key={c.field}>
          <span className="font-semibold text-stone-700">{c.field}</span>: <span className="text-stone-500 line-through decoration-stone-300">{c.from}</span>{' '}
          → <span className="text-stone-900">{c.to}</span>
        </li>
      ))}
      {changes.length > 6 && <li className="text-stone-500">and {changes.length - 6} more</li>}
    </ul>
  );
}

export function AuditTable({ events, showRecord = true, shops }: { events: AuditEvent[]; showRecord?: boolean; shops?: ShopRef[] }) {
  // Shop ids in a change read as "PV · Vessel Bay".
  const names = useMemo(() => new Map((shops ?? []).map((s) => [s.id, `${s.code} · ${s.name}`])), [shops]);
  const columns = useMemo(
    () => [
      column.accessor('at', { header: 'When', cell: (i) => <span className="whitespace-nowrap">{when(i.getValue())}</span>, meta: { className: 'w-44' } }),
      column.accessor((e) => e.actor?.name ?? 'Beadroll', { id: 'actor', header: 'Who' }),
      column.accessor('action', { header: 'What', cell: (i) => <span className="font-semibold">{actionLabel(i.getValue())}</span> }),
      ...(showRecord
        ? [
            column.accessor('entityType', {
              header: 'Record',
              cell: (i) =>
                i.getValue() === 'welder' ? (
                  <Link className="text-accent-700 hover:underline" to={paths.welder.href(i.row.original.entityId)}>
                    Welder file
                  </Link>
                ) : (
                  <span className="capitalize">{i.getValue()}</span>
                ),
            }),
          ]
        : []),
      column.display({ id: 'changes', header: 'Change', cell: (i) => <Changes event={i.row.original} names={names} /> }),
    ],
    [showRecord, names],
  );
  const table = useReactTable({ data: events, columns, getCoreRowModel: getCoreRowModel(), getRowId: (e) => e.id, enableSorting: false });
  return <DataTable table={table} caption="Audit events" empty="Nothing recorded yet." />;
}
