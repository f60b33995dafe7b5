'use client';

import { flexRender, type SortingState, type Table } from '@tanstack/react-table';
import type { JobRowJson } from '~/lib/queries/jobs';
import { SORTABLE } from './job-columns';

const isNumeric = (meta: unknown) => (meta as { numeric?: boolean } | undefined)?.numeric;

/** The page of jobs; sortable columns have a button in their heading that says the order. */
export function JobTable(props: {
  table: Table<JobRowJson>;
  sorting: SortingState;
  sortBy: (columnId: string) => void;
  busy: boolean;
}) {
  const { table, sorting } = props;
  return (
    <table className="w-full min-w-[56rem] text-left" aria-busy={props.busy}>
      <caption className="sr-only">Jobs; select a column heading to sort by it</caption>
      <thead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id} className="border-y border-sand-300 bg-sand-50 text-sm text-slate-700">
            {group.headers.map((header) => {
              const numeric = isNumeric(header.column.columnDef.meta);
              const sortable = header.column.id in SORTABLE;
              const sorted = sorting.find((s) => s.id === header.column.id);
              const label = flexRender(header.column.columnDef.header, header.getContext());
              return (
                <th
                  key={header.id}
                  scope="col"
                  aria-sort={sorted ? (sorted.desc ? 'descending' : 'ascending') : undefined}
                  className={`px-2 py-1 font-semibold first:pl-5 last:pr-5 ${numeric ? 'num' : ''}`}
                >
                  {sortable ? (
                    <button
                      type="button"
                      onClick={() => props.sortBy(header.column.id)}
                      className="-mx-1 inline-flex min-h-11 items-center gap-1 rounded px-1 whitespace-nowrap hover:bg-sand-200"
                    >
                      {label}
                      <span aria-hidden="true" className="text-slate-500">
                        {sorted ? (sorted.desc ? '▼' : '▲') : '↕'}
                      </span>
                    </button>
                  ) : (
                    label
                  )}
                </th>
              );
            })}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => (
          <tr key={row.id} className="border-b border-sand-100 align-top hover:bg-sand-50">
            {row.getVisibleCells().map((cell) => {
              const numeric = isNumeric(cell.column.columnDef.meta);
              return (
                <td
                  key={cell.id}
                  className={`px-2 py-2.5 first:pl-5 last:pr-5 ${numeric ? 'num' : ''}`}
                >
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              );
            })}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
