import type { Welder } from '@beadroll/rules';
import { createColumnHelper, getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { useState } from 'react';
import { MemoryRouter } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { WeldersTable } from '@/features/welders/components/welders-table';
import { DataTable } from './data-table';

interface Row {
  stamp: string;
  name: string;
  email: string;
}
const column = createColumnHelper<Row>();
const columns = [
  column.accessor('stamp', { header: 'Stamp' }),
  column.accessor('name', { header: 'Name' }),
  column.accessor('email', { header: 'E-mail', enableSorting: false }),
];
const rows: Row[] = [
  { stamp: 'A-1', name: 'Bo', email: 'b@x.example' },
  { stamp: 'A-2', name: 'Al', email: 'a@x.example' },
];

/** A table whose sorting is "manual", as on the Welders screen: it only reports what was clicked. */
function Harness({ log }: { log: SortingState[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'stamp', desc: false }]);
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: (updater) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      log.push(next);
      setSorting(next);
    },
    manualSorting: true,
    enableSortingRemoval: false,
    sortDescFirst: false,
    getCoreRowModel: getCoreRowModel(),
  });
  return <DataTable table={table} caption="Test" />;
}

describe('DataTable sort headers', () => {
  it('makes sortable headers buttons that report asc → desc and a new column starting ascending', async () => {
    const user = userEvent.setup();
    const log: SortingState[] = [];
    render(<Harness log={log} />);

    const stamp = screen.getByRole('columnheader', { name: /Stamp/ });
    expect(stamp.getAttribute('aria-sort')).toBe('ascending');
    expect(screen.getByRole('columnheader', { name: /Name/ }).getAttribute('aria-sort')).toBe('none');
    // A column the server cannot sort by has no button and no aria-sort.
    const email = screen.getByRole('columnheader', { name: 'E-mail' });
    expect(within(email).queryByRole('button')).toBeNull();
    expect(email.getAttribute('aria-sort')).toBeNull();

    await user.click(within(stamp).getByRole('button', { name: /Stamp/ }));
    expect(log.at(-1)).toEqual([{ id: 'stamp', desc: true }]);
    expect(screen.getByRole('columnheader', { name: /Stamp/ }).getAttribute('aria-sort')).toBe('descending');

    await user.click(screen.getByRole('button', { name: /Name/ }));
    expect(log.at(-1)).toEqual([{ id: 'name', desc: false }]);
    expect(screen.getByRole('columnheader', { name: /Stamp/ }).getAttribute('aria-sort')).toBe('none');
  });

  it('shows the empty message across the whole row when there is nothing to show', () => {
    function Empty() {
      const table = useReactTable({ data: [] as Row[], columns, getCoreRowModel: getCoreRowModel() });
      return <DataTable table={table} empty="No welder matches these filters." />;
    }
    render(<Empty />);
    const cell = screen.getByRole('cell', { name: 'No welder matches these filters.' });
    expect(cell.getAttribute('colspan')).toBe('3');
  });
});

const welder = (over: Partial<Welder>): Welder => ({
  id: 'w1',
  stamp: 'PV-07',
  name: 'Test Welder',
  homeShop: { id: 's1', code: 'PV', name: 'Test Bay' },
  email: '',
  active: true,
  hasAccount: false,
  version: 1,
  createdAt: '2026-01-05T10:00:00.000Z',
  ...over,
});

describe('WeldersTable', () => {
  it('has the column headers the browser tests rely on, and shows status as word and icon', () => {
    render(
      <MemoryRouter>
        <WeldersTable
          welders={[welder({}), welder({ id: 'w2', stamp: 'PV-08', active: false, email: 'left@x.example' })]}
          sorting={[{ id: 'stamp', desc: false }]}
          onSortingChange={() => undefined}
        />
      </MemoryRouter>,
    );
    const headers = screen.getAllByRole('columnheader').map((h) => h.textContent);
    expect(headers).toEqual(['Stamp', 'Name', 'Home shop', 'E-mail', 'Status', 'Qualifications', 'Soonest lapse']);
    for (const sortable of ['Stamp', 'Name', 'Home shop', 'Soonest lapse']) expect(screen.getByRole('button', { name: sortable })).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Status' })).toBeNull();

    const left = screen.getByText('Left');
    expect(left.closest('[data-tone]')?.getAttribute('data-tone')).toBe('neutral');
    expect(left.closest('[data-tone]')?.querySelector('svg')).not.toBeNull();
    expect(screen.getByRole('link', { name: 'PV-08' }).getAttribute('href')).toBe('/welders/w2');
  });
});
