import type { CouponRecord } from '@beadroll/rules';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { StatusChip } from '@/components/ui/status-chip';
import { paths } from '@/config/paths';
import { codeNames } from '@/lib/codes';

const column = createColumnHelper<CouponRecord>();

export function CouponsTable({ coupons, showWelder = true, empty }: { coupons: CouponRecord[]; showWelder?: boolean; empty?: string }) {
  const columns = [
    ...(showWelder
      ? [
          column.accessor((c) => `${c.welder.stamp} ${c.welder.name}`, {
            id: 'welder',
            header: 'Welder',
            cell: ({ row }) => (
              <Link to={paths.welder.href(row.original.welder.id)} className="font-semibold text-accent-700 hover:underline">
                <span className="tabular-nums">{row.original.welder.stamp}</span> · {row.original.welder.name}
              </Link>
            ),
          }),
        ]
      : []),
    column.accessor('testedOn', {
      header: 'Date',
      cell: ({ row }) => (
        <Link to={paths.coupon.href(row.original.id)} className="font-semibold tabular-nums text-accent-700 hover:underline" aria-label={`Coupon of ${row.original.testedOn}, ${row.original.welder.stamp}`}>
          {row.original.testedOn}
        </Link>
      ),
    }),
    column.accessor((c) => codeNames[c.coupon.code] ?? c.coupon.code, { id: 'code', header: 'Code' }),
    column.accessor((c) => c.coupon.process, { id: 'process', header: 'Process' }),
    column.accessor((c) => `${c.coupon.position} ${c.coupon.form}`, { id: 'position', header: 'Position' }),
    column.accessor('result', {
      header: 'Result',
      cell: ({ row }) => (
        <span className="flex items-center gap-2">
          <StatusChip status={`coupon.${row.original.result}`} />
          {row.original.qualificationId && <span className="text-xs text-stone-600">certified</span>}
        </span>
      ),
    }),
  ];
  const table = useReactTable({ data: coupons, columns, getCoreRowModel: getCoreRowModel(), enableSorting: false });
  return <DataTable table={table} caption="Coupons" empty={empty ?? 'No coupons recorded.'} />;
}
