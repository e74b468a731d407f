import { formatLength, type Procedure } from '@beadroll/rules';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { Button } from '@/components/ui/button';
import { StatusChip } from '@/components/ui/status-chip';
import { codeNames } from '@/lib/codes';
import { uploadContentUrl } from '@/lib/uploads';

const column = createColumnHelper<Procedure>();

function thicknessRange(p: Procedure): string {
  if (!p.thicknessMin && !p.thicknessMax) return '—';
  if (p.thicknessMin && p.thicknessMax) return `${formatLength(p.thicknessMin)} to ${formatLength(p.thicknessMax)}`;
  if (p.thicknessMin) return `${formatLength(p.thicknessMin)} and over`;
  return `up to ${formatLength(p.thicknessMax ?? { value: 0, unit: 'in' })}`;
}

interface ProceduresTableProps {
  procedures: Procedure[];
  canEdit: boolean;
  onEdit: (p: Procedure) => void;
  onSupersede: (p: Procedure) => void;
  empty: string;
}

export function ProceduresTable({ procedures, canEdit, onEdit, onSupersede, empty }: ProceduresTableProps) {
  const columns = [
    column.accessor('number', { header: 'Number', cell: (c) => <span className="font-semibold tabular-nums">{c.getValue()}</span> }),
    column.accessor('revision', { header: 'Revision' }),
    column.accessor((p) => codeNames[p.code], { id: 'code', header: 'Code' }),
    column.accessor((p) => p.processes.join(', '), { id: 'processes', header: 'Processes' }),
    column.accessor((p) => p.pNumbers.join(', ') || '—', { id: 'pNumbers', header: 'P-Nos.' }),
    column.accessor((p) => p.fNumber ?? '—', { id: 'fNumber', header: 'F-No.' }),
    column.accessor((p) => p.positions.join(', ') || '—', { id: 'positions', header: 'Positions' }),
    column.accessor(thicknessRange, { id: 'thickness', header: 'Thickness' }),
    column.accessor('status', { header: 'Status', cell: (c) => <StatusChip status={`procedure.${c.getValue()}`} /> }),
    column.accessor('document', {
      header: 'Document',
      cell: ({ row }) =>
        row.original.document ? (
          <a className="font-semibold text-accent-700 underline" href={uploadContentUrl(row.original.document.id)} download={row.original.document.fileName}>
            Download<span className="sr-only"> {row.original.number} rev {row.original.revision}</span>
          </a>
        ) : (
          <span className="text-stone-500">None</span>
        ),
    }),
    ...(canEdit
      ? [
          column.display({
            id: 'actions',
            header: () => <span className="sr-only">Actions</span>,
            cell: ({ row }) => (
              <span className="flex gap-1">
                <Button size="row" onClick={() => onEdit(row.original)} aria-label={`Edit ${row.original.number} rev ${row.original.revision}`}>
                  Edit
                </Button>
                {row.original.status === 'active' && (
                  <Button size="row" variant="ghost" onClick={() => onSupersede(row.original)} aria-label={`Supersede ${row.original.number} rev ${row.original.revision}`}>
                    Supersede
                  </Button>
                )}
              </span>
            ),
          }),
        ]
      : []),
  ];
  const table = useReactTable({ data: procedures, columns, getCoreRowModel: getCoreRowModel(), enableSorting: false });
  return <DataTable table={table} caption="WPS register" empty={empty} />;
}
