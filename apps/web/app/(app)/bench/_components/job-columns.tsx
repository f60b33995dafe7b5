import type { ColumnDef } from '@tanstack/react-table';
import Link from 'next/link';
import { StateBadge } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { SERVICE_LABELS } from '~/lib/labels';
import type { JobRowJson } from '~/lib/queries/jobs';
import type { JobSort } from '~/lib/jobs';
import { formatCents } from './format';

/** Columns that sort, and what each asks the server for. "Days in state" sorts by the date it counts from. */
export const SORTABLE: Record<string, { sort: JobSort; invert?: boolean }> = {
  id: { sort: 'id' },
  customer: { sort: 'customer' },
  daysInState: { sort: 'stateChangedAt', invert: true },
  checkedInAt: { sort: 'checkedInAt' },
  promisedAt: { sort: 'promisedAt' },
};

/** The bench list's columns; the shop shows under the job number when several shops are in view. */
export function jobColumns(multiShop: boolean): ColumnDef<JobRowJson>[] {
  return [
    {
      id: 'id',
      header: 'Job',
      cell: ({ row }) => (
        <>
          <Link
            href={`/bench/jobs/${row.original.id}`}
            className="inline-flex min-h-11 items-center font-semibold text-sea-700 tabular-nums underline-offset-2 hover:underline"
          >
            #{row.original.id}
          </Link>
          <span className="block text-sm whitespace-nowrap text-slate-700">
            {SERVICE_LABELS[row.original.serviceType]}
          </span>
          {multiShop && (
            <span className="block text-sm text-slate-600">{row.original.shopName}</span>
          )}
        </>
      ),
    },
    {
      id: 'customer',
      header: 'Customer and reel',
      cell: ({ row }) => (
        <>
          <span className="block font-medium">{row.original.customerName}</span>
          <span className="block text-sm text-slate-600">{row.original.reel}</span>
        </>
      ),
    },
    {
      id: 'state',
      header: 'State',
      cell: ({ row }) => <StateBadge state={row.original.state} />,
    },
    {
      id: 'daysInState',
      header: 'In state',
      meta: { numeric: true },
      cell: ({ row }) => {
        const d = row.original.daysInState;
        if (d === null) return <span aria-label="Not open">–</span>;
        return <span className="whitespace-nowrap">{d === 1 ? '1 day' : `${d} days`}</span>;
      },
    },
    {
      id: 'technician',
      header: 'Technician',
      cell: ({ row }) =>
        row.original.technicianName ?? <span className="text-slate-600">Unassigned</span>,
    },
    {
      id: 'checkedInAt',
      header: 'Checked in',
      cell: ({ row }) => (
        <>
          <span className="block whitespace-nowrap">
            {formatInZone(new Date(row.original.checkedInAt), row.original.timeZone)}
          </span>
          {row.original.ageDays !== null && (
            <span className="block text-sm whitespace-nowrap text-slate-600">
              {row.original.ageDays === 1 ? '1 day open' : `${row.original.ageDays} days open`}
            </span>
          )}
        </>
      ),
    },
    {
      id: 'promisedAt',
      header: 'Promised',
      cell: ({ row }) =>
        row.original.promisedAt ? (
          <>
            <span className="block whitespace-nowrap">
              {formatInZone(new Date(row.original.promisedAt), row.original.timeZone)}
            </span>
            {row.original.late && (
              <span className="mt-0.5 inline-block rounded bg-brick-50 px-1.5 text-sm font-medium text-brick-800 ring-1 ring-brick-200 ring-inset">
                Late
              </span>
            )}
          </>
        ) : (
          '–'
        ),
    },
    {
      id: 'total',
      header: 'Total',
      meta: { numeric: true },
      cell: ({ row }) => formatCents(row.original.totalCents),
    },
  ];
}
