// A dense, scannable table over a TanStack Table instance. Sortable headers are buttons that say which
// way they sort (aria-sort on the header cell); sorting and paging themselves happen wherever the
// table's state lives (for the Welders list: the URL and the server).
import { flexRender, type Header, type Table } from '@tanstack/react-table';
import type { ReactNode } from 'react';
import { ChevronLeftIcon, ChevronRightIcon, SortIcon } from './icons';
import { Spinner } from './spinner';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData, TValue> {
    /** Extra classes for the column's cells, e.g. a fixed width or right alignment. */
    className?: string;
  }
}

function ariaSort(direction: false | 'asc' | 'desc'): 'ascending' | 'descending' | 'none' {
  if (direction === 'asc') return 'ascending';
  if (direction === 'desc') return 'descending';
  return 'none';
}

export function SortHeader<T>({ header }: { header: Header<T, unknown> }) {
  const label = flexRender(header.column.columnDef.header, header.getContext());
  const direction = header.column.getIsSorted();
  const className = `px-3 py-2 text-left text-xs font-semibold uppercase tracking-wide text-stone-600 ${header.column.columnDef.meta?.className ?? ''}`;
  if (!header.column.getCanSort()) {
    return (
      <th scope="col" className={className}>
        {label}
      </th>
    );
  }
  return (
    <th scope="col" aria-sort={ariaSort(direction)} className={className}>
      <button
        type="button"
        onClick={header.column.getToggleSortingHandler()}
        className="-mx-1 inline-flex min-h-8 items-center gap-1 rounded px-1 uppercase hover:bg-stone-200/60 hover:text-stone-900"
      >
        {label}
        <SortIcon sorted={direction} className={`size-3.5 ${direction ? 'text-accent-600' : 'text-stone-400'}`} />
      </button>
    </th>
  );
}

interface DataTableProps<T> {
  table: Table<T>;
  caption?: string;
  empty?: ReactNode;
  /** True while a newer page is being fetched; the old rows stay visible but dimmed. */
  refreshing?: boolean;
}

export function DataTable<T>({ table, caption, empty, refreshing = false }: DataTableProps<T>) {
  const rows = table.getRowModel().rows;
  const columnCount = table.getVisibleLeafColumns().length;
  return (
    <div className="relative overflow-x-auto rounded-lg border border-stone-200 bg-white shadow-sm">
      <table className="min-w-full border-collapse text-sm" aria-busy={refreshing || undefined}>
        {caption && <caption className="sr-only">{caption}</caption>}
        <thead className="border-b border-stone-200 bg-stone-100/80">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => (
                <SortHeader key={header.id} header={header} />
              ))}
            </tr>
          ))}
        </thead>
        <tbody className={`divide-y divide-stone-100 ${refreshing ? 'opacity-60' : ''}`}>
          {rows.length === 0 ? (
            <tr>
              <td colSpan={columnCount} className="px-3 py-8 text-center text-stone-600">
                {empty ?? 'Nothing to show.'}
              </td>
            </tr>
          ) : (
            rows.map((row) => (
              <tr key={row.id} className="hover:bg-accent-50/50">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-3 py-2 align-middle sm:py-1 ${cell.column.columnDef.meta?.className ?? ''}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))
          )}
        </tbody>
      </table>
      {refreshing && (
        <div className="pointer-events-none absolute right-3 top-2 text-accent-600" role="status" aria-label="Updating">
          <Spinner className="size-4" />
        </div>
      )}
    </div>
  );
}

interface PaginationProps {
  page: number;
  pageSize: number;
  total: number;
  onPageChange: (page: number) => void;
  onPageSizeChange?: (pageSize: number) => void;
  noun?: string;
}

export function Pagination({ page, pageSize, total, onPageChange, onPageSizeChange, noun = 'rows' }: PaginationProps) {
  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  const navButton =
    'inline-flex min-h-11 min-w-11 items-center justify-center rounded-md bg-white ring-1 ring-inset ring-stone-300 hover:bg-stone-50 disabled:opacity-50 disabled:cursor-not-allowed sm:min-h-8 sm:min-w-8';
  return (
    <nav aria-label="Pages" className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm text-stone-600">
      <p aria-live="polite">
        {total === 0 ? `No ${noun}` : `${first}–${last} of ${total} ${noun}`}
      </p>
      <div className="flex items-center gap-2">
        {onPageSizeChange && (
          <label className="flex items-center gap-1.5">
            <span>Per page</span>
            <select
              value={pageSize}
              onChange={(e) => onPageSizeChange(Number(e.target.value))}
              className="min-h-11 rounded-md border border-stone-300 bg-white px-2 sm:min-h-8"
            >
              {[25, 50, 100, 200].map((n) => (
                <option key={n} value={n}>
                  {n}
                </option>
              ))}
            </select>
          </label>
        )}
        <button type="button" className={navButton} onClick={() => onPageChange(page - 1)} disabled={page <= 1} aria-label="Previous page">
          <ChevronLeftIcon />
        </button>
        <span>
          Page {Math.min(page, pageCount)} of {pageCount}
        </span>
        <button type="button" className={navButton} onClick={() => onPageChange(page + 1)} disabled={page >= pageCount} aria-label="Next page">
          <ChevronRightIcon />
        </button>
      </div>
    </nav>
  );
}
