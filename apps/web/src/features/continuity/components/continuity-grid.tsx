// The month's grid: a row per welder, a column per process. Each cell is a "Used" tick box (space
// toggles), the job or traveler reference, the day of use and an optional note, in tab order; each
// column header carries the fill-down for a job the whole crew worked.
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { useMemo, useState, type ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { controlClasses } from '@/components/ui/field';
import { AlertIcon } from '@/components/ui/icons';
import { ConfirmDialog } from '@/components/ui/dialog';
import { cellKey, cellStates, fillSource, type CellValue, type CodeState, type DraftRow, type FillScope, type GridDraft } from '../model/grid-draft';

export type CellErrors = Record<string, Partial<Record<keyof CellValue | 'process', string>>>;

interface GridProps {
  draft: GridDraft;
  readOnly: boolean;
  errors: CellErrors;
  /** Cells another person changed since the month was opened (after a 409), with whose change it is. */
  conflicts?: Record<string, string>;
  onCell: (welderId: string, process: string, patch: Partial<CellValue>) => void;
  onFill: (process: string, scope: FillScope, jobReference?: string, usedOn?: string) => void;
  onTakeTheirs?: (welderId: string, process: string) => void;
}

const stateStyle: Record<CodeState['kind'], string> = {
  current: 'bg-emerald-50 text-emerald-900 ring-emerald-600/25',
  lapsing: 'bg-amber-50 text-amber-900 ring-amber-600/30',
  lapsed: 'bg-red-50 text-red-800 ring-red-600/25',
  revoked: 'bg-stone-100 text-stone-800 ring-stone-500/30',
};
function stateText(c: CodeState): string {
  if (c.kind === 'revoked') return `${c.label}: revoked ${c.revokedOn ?? ''}`;
  if (c.kind === 'lapsed') return `${c.label}: lapsed ${c.lapsesOn}`;
  const days = `${c.daysLeft} ${c.daysLeft === 1 ? 'day' : 'days'} left`;
  return c.revokedOn ? `${c.label}: ${days} (revoked from ${c.revokedOn})` : `${c.label}: ${days}`;
}

/** Each code's state of the cell's process today: days left, lapsed or revoked — in words, not colour alone. */
function CellState({ row, process, today }: { row: DraftRow; process: string; today: string }) {
  const states = cellStates(row, process, today);
  if (states.length === 0) return null;
  return (
    <ul className="flex flex-wrap gap-1" aria-label={`${row.welder.stamp} ${process} status`}>
      {states.map((c) => (
        <li key={c.code} className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-xs font-semibold ring-1 ${stateStyle[c.kind]}`}>
          {c.kind !== 'current' && <AlertIcon className="size-3.5" />}
          {stateText(c)}
        </li>
      ))}
    </ul>
  );
}

const helper = createColumnHelper<DraftRow>();

/**
 * Calls a header or cell renderer as a plain function. (flexRender would mount it as a component, and
 * the renderers are rebuilt on every keystroke, so the inputs would remount and lose the focus.)
 */
function renderPart<C>(part: unknown, context: C): ReactNode {
  return typeof part === 'function' ? (part as (c: C) => ReactNode)(context) : (part as ReactNode);
}
const small = 'min-h-11 sm:min-h-8 px-2 text-sm';

export function ContinuityGrid({ draft, readOnly, errors, conflicts = {}, onCell, onFill, onTakeTheirs }: GridProps) {
  const columns = useMemo(
    () => [
      helper.display({
        id: 'welder',
        header: 'Welder',
        cell: ({ row }) => (
          <div className="min-w-40">
            <p className="font-mono font-semibold text-stone-900">{row.original.welder.stamp}</p>
            <p className="text-sm text-stone-700">{row.original.welder.name}</p>
            {!row.original.home && <p className="text-xs text-stone-500">From another shop</p>}
          </div>
        ),
      }),
      ...draft.processes.map((process) =>
        helper.display({
          id: process,
          header: () => <FillHeader process={process} draft={draft} readOnly={readOnly} onFill={onFill} />,
          cell: ({ row }) => {
            const cell = row.original.cells[process];
            if (!cell?.enabled) return <span className="text-sm text-stone-400">Not qualified</span>;
            const who = `${row.original.welder.stamp} ${process}`;
            const key = cellKey(row.original.welder.id, process);
            const error = errors[key] ?? {};
            const errorId = `err-${key}`;
            const messages = Object.values(error).filter(Boolean);
            const conflict = conflicts[key];
            return (
              <div className={`min-w-56 space-y-1 rounded-md p-1 ${cell.used ? 'bg-accent-50/60' : ''}`} data-cell={key}>
                <div className="flex items-center gap-2">
                  <label className="flex min-h-11 items-center gap-2 text-sm font-semibold sm:min-h-8">
                    <input
                      type="checkbox"
                      className="size-6 accent-accent-600 sm:size-5"
                      checked={cell.used}
                      disabled={readOnly}
                      aria-label={`${who} used`}
                      onChange={(e) => onCell(row.original.welder.id, process, { used: e.target.checked })}
                    />
                    Used
                  </label>
                  {cell.flaggedLapsed && (
                    <span
                      className="inline-flex items-center gap-1 rounded-full bg-red-50 px-2 py-0.5 text-xs font-semibold text-red-800 ring-1 ring-red-600/25"
                      title="This use was logged on a date when the qualification had already lapsed: it is not evidence and waits for the QA manager's review."
                    >
                      <AlertIcon className="size-3.5" /> Logged while lapsed
                    </span>
                  )}
                </div>
                <CellState row={row.original} process={process} today={draft.today} />
                {conflict && (
                  <div className="rounded-md border border-amber-300 bg-amber-50 p-2 text-xs text-amber-900" role="alert">
                    <p>{conflict}. Your entry is kept below: save again to reapply it.</p>
                    {onTakeTheirs && (
                      <Button size="row" variant="ghost" onClick={() => onTakeTheirs(row.original.welder.id, process)} aria-label={`${who} keep their change`}>
                        Keep their change
                      </Button>
                    )}
                  </div>
                )}
                <input
                  className={`${controlClasses(Boolean(error.jobReference))} ${small}`}
                  placeholder="Job or traveler"
                  value={cell.jobReference}
                  disabled={readOnly}
                  aria-label={`${who} job`}
                  aria-invalid={Boolean(error.jobReference) || undefined}
                  aria-describedby={messages.length ? errorId : undefined}
                  onChange={(e) => onCell(row.original.welder.id, process, { jobReference: e.target.value })}
                />
                <div className="flex gap-1">
                  <input
                    className={`${controlClasses(Boolean(error.note))} ${small}`}
                    placeholder="Note (optional)"
                    value={cell.note}
                    disabled={readOnly}
                    aria-label={`${who} note`}
                    onChange={(e) => onCell(row.original.welder.id, process, { note: e.target.value })}
                  />
                  <input
                    type="date"
                    className={`${controlClasses(Boolean(error.usedOn))} ${small} w-36`}
                    value={cell.usedOn}
                    required={cell.used}
                    min={`${draft.month}-01`}
                    disabled={readOnly}
                    aria-label={`${who} used on`}
                    aria-invalid={Boolean(error.usedOn) || undefined}
                    onChange={(e) => onCell(row.original.welder.id, process, { usedOn: e.target.value })}
                  />
                </div>
                {messages.length > 0 && (
                  <p id={errorId} className="flex items-start gap-1 text-sm text-red-700">
                    <AlertIcon className="mt-0.5 size-4 shrink-0" /> {messages.join(' · ')}
                  </p>
                )}
              </div>
            );
          },
        }),
      ),
    ],
    [draft, readOnly, errors, conflicts, onCell, onFill, onTakeTheirs],
  );

  const table = useReactTable({ data: draft.rows, columns, getCoreRowModel: getCoreRowModel(), getRowId: (r) => r.welder.id });

  return (
    <div className="overflow-x-auto rounded-lg border border-stone-200 bg-white shadow-sm">
      <table className="min-w-full divide-y divide-stone-200" aria-label={`Continuity log ${draft.month}`}>
        <thead className="bg-stone-50">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => (
                <th key={header.id} scope="col" className="px-3 py-2 text-left align-top text-xs font-semibold text-stone-600">
                  {renderPart(header.column.columnDef.header, header.getContext())}
                </th>
              ))}
            </tr>
          ))}
        </thead>
        <tbody className="divide-y divide-stone-100">
          {table.getRowModel().rows.map((row) => (
            <tr key={row.id} data-welder={row.original.welder.stamp}>
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-3 py-2 align-top">
                  {renderPart(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/**
 * The column header: the process, and the fill-down of one job reference (and, if given, one day of use)
 * typed once for the column. It fills empty cells only; overwriting other jobs is asked for separately.
 */
function FillHeader({ process, draft, readOnly, onFill }: { process: string; draft: GridDraft; readOnly: boolean; onFill: GridProps['onFill'] }) {
  const [job, setJob] = useState('');
  const [day, setDay] = useState('');
  const [confirmAll, setConfirmAll] = useState(false);
  const source = job.trim() || fillSource(draft, process);
  return (
    <div className="min-w-56 space-y-1">
      <span className="block text-sm font-bold text-stone-900">{process}</span>
      {!readOnly && (
        <>
          <input
            className={`${controlClasses(false)} ${small}`}
            placeholder="Job for the column"
            value={job}
            aria-label={`Job for every ${process} row`}
            onChange={(e) => setJob(e.target.value)}
          />
          <input
            type="date"
            className={`${controlClasses(false)} ${small} w-40`}
            value={day}
            min={`${draft.month}-01`}
            max={`${draft.month}-31`}
            aria-label={`Day of use for filled ${process} rows`}
            title="The day the crew used the process; filled cells without one must be dated before saving"
            onChange={(e) => setDay(e.target.value)}
          />
          <div className="flex flex-wrap gap-1">
            <Button
              size="row"
              onClick={() => onFill(process, 'empty', source ?? undefined, day || undefined)}
              disabled={!source}
              aria-label={`Fill job down ${process}`}
              title="Put this job into the empty cells of the column and mark them used; cells you unticked stay unticked"
            >
              Fill job down
            </Button>
            <Button
              size="row"
              variant="ghost"
              onClick={() => setConfirmAll(true)}
              disabled={!source}
              aria-label={`Overwrite every job ${process}`}
              title="Also replace the jobs already entered in this column"
            >
              Overwrite all
            </Button>
          </div>
          <p className="text-xs font-normal text-stone-500">{source ? `Fills “${source}”${day ? ` on ${day}` : ''}` : 'Type a job to fill down'}</p>
          <ConfirmDialog
            open={confirmAll}
            title={`Replace every ${process} job?`}
            confirmLabel="Replace the jobs"
            onConfirm={() => {
              setConfirmAll(false);
              onFill(process, 'all', source ?? undefined, day || undefined);
            }}
            onCancel={() => setConfirmAll(false)}
          >
            {`Every ticked or empty ${process} cell gets “${source ?? ''}”, replacing the jobs already entered. Cells you unticked stay unticked.`}
          </ConfirmDialog>
        </>
      )}
    </div>
  );
}
