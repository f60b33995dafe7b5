'use client';

import { useQuery } from '@tanstack/react-query';
import {
  flexRender,
  getCoreRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import Link from 'next/link';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { useCallback, useEffect, useMemo, useState } from 'react';
import { Empty, StateBadge } from '~/components/ui';
import { formatCount, formatInZone } from '~/lib/format';
import { JOB_STATE_LABELS, JOB_STATES, SERVICE_LABELS, type JobState } from '~/lib/labels';
import { jobsPageQuery, listParams, type JobRowJson } from '~/lib/queries/jobs';
import { PAGE_SIZES, SERVICE_TYPES, type JobSort } from '~/lib/validators/jobs';
import { formatCents } from './format';

interface Props {
  shops: { id: number; name: string; timeZone: string }[];
  technicians: { id: number; name: string; shopId: number }[];
  /** Parameters of the URL that the schema refused, if any. */
  invalidQuery: string[] | null;
}

/** Columns that sort, and what each asks the server for. "Days in state" sorts by the date it counts from. */
const SORTABLE: Record<string, { sort: JobSort; invert?: boolean }> = {
  id: { sort: 'id' },
  customer: { sort: 'customer' },
  daysInState: { sort: 'stateChangedAt', invert: true },
  checkedInAt: { sort: 'checkedInAt' },
  promisedAt: { sort: 'promisedAt' },
};

const fieldClass =
  'mt-1 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-base text-slate-900';
const labelClass = 'block text-sm font-medium text-slate-700';

export function JobList({ shops, technicians, invalidQuery }: Props) {
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const params = useMemo(() => listParams(new URLSearchParams(search.toString())), [search]);
  const multiShop = shops.length > 1;

  const update = useCallback(
    (changes: Record<string, string | undefined>, keepPage = false) => {
      const next = new URLSearchParams(params);
      for (const [key, value] of Object.entries(changes)) {
        if (value === undefined || value === '') next.delete(key);
        else next.set(key, value);
      }
      if (!keepPage) next.delete('page');
      const qs = next.toString();
      router.replace(qs ? `${pathname}?${qs}` : pathname, { scroll: false });
    },
    [params, pathname, router],
  );

  const [text, setText] = useState(params.q ?? '');
  const [lastQ, setLastQ] = useState(params.q ?? '');
  // Someone else changed the URL's search (Clear filters, back button): show it in the box.
  if ((params.q ?? '') !== lastQ) {
    setLastQ(params.q ?? '');
    setText(params.q ?? '');
  }
  useEffect(() => {
    if (text.trim() === (params.q ?? '')) return;
    const timer = setTimeout(() => update({ q: text.trim() || undefined }), 350);
    return () => clearTimeout(timer);
  }, [text, params.q, update]);

  const { data, isError, error, isFetching } = useQuery({
    ...jobsPageQuery(params),
    enabled: !invalidQuery,
  });

  const states = (params.state?.split(',') ?? []) as JobState[];
  const toggleState = (s: JobState) => {
    const next = states.includes(s) ? states.filter((x) => x !== s) : [...states, s];
    update({ state: JOB_STATES.filter((x) => next.includes(x)).join(',') || undefined });
  };
  const sort = (params.sort as JobSort | undefined) ?? 'checkedInAt';
  const dir = params.dir ?? 'desc';
  const sorting: SortingState = Object.entries(SORTABLE)
    .filter(([, s]) => s.sort === sort)
    .map(([id, s]) => ({ id, desc: s.invert ? dir === 'asc' : dir === 'desc' }));
  const pageSize = Number(params.pageSize ?? 25);
  const page = Number(params.page ?? 1);
  const total = data?.total ?? 0;
  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  const asOf = data?.asOf;

  const columns = useMemo<ColumnDef<JobRowJson>[]>(
    () => [
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
    ],
    [multiShop],
  );

  const table = useReactTable({
    data: data?.jobs ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
    manualFiltering: true,
    pageCount,
    state: { sorting, pagination: { pageIndex: page - 1, pageSize } },
    getRowId: (row) => String(row.id),
  });

  const sortBy = (columnId: string) => {
    const s = SORTABLE[columnId]!;
    const current = sorting.find((x) => x.id === columnId);
    // A new column starts with what people look for first: latest dates, longest waits, A to Z.
    const desc = current ? !current.desc : columnId !== 'customer';
    update({ sort: s.sort, dir: (s.invert ? !desc : desc) ? 'desc' : 'asc' });
  };

  const shopId = params.shopId ? Number(params.shopId) : undefined;
  const shownTechnicians = technicians.filter((t) => shopId === undefined || t.shopId === shopId);
  const filtered = Object.keys(params).some(
    (k) => !['sort', 'dir', 'page', 'pageSize'].includes(k),
  );
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);

  return (
    <div className="rounded-lg border border-sand-200 bg-white shadow-sm">
      <form
        role="search"
        aria-label="Filter jobs"
        className="space-y-4 border-b border-sand-200 p-5"
        onSubmit={(e) => {
          e.preventDefault();
          update({ q: text.trim() || undefined });
        }}
      >
        <div
          className={`grid gap-4 md:grid-cols-2 ${multiShop ? 'lg:grid-cols-4' : 'lg:grid-cols-[2fr_1fr_1fr]'}`}
        >
          <div className={multiShop ? '' : 'md:col-span-2 lg:col-span-1'}>
            <label htmlFor="job-search" className={labelClass}>
              Search
            </label>
            <input
              id="job-search"
              type="search"
              value={text}
              onChange={(e) => setText(e.target.value)}
              placeholder="Name, phone, e-mail, reel or #job"
              className={fieldClass}
            />
          </div>
          {multiShop && (
            <div>
              <label htmlFor="job-shop" className={labelClass}>
                Shop
              </label>
              <select
                id="job-shop"
                value={params.shopId ?? ''}
                onChange={(e) => update({ shopId: e.target.value, technicianId: undefined })}
                className={fieldClass}
              >
                <option value="">All shops</option>
                {shops.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </select>
            </div>
          )}
          <div>
            <label htmlFor="job-technician" className={labelClass}>
              Technician
            </label>
            <select
              id="job-technician"
              value={params.technicianId ?? ''}
              onChange={(e) => update({ technicianId: e.target.value })}
              className={fieldClass}
            >
              <option value="">Anyone</option>
              {shownTechnicians.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="job-service" className={labelClass}>
              Service
            </label>
            <select
              id="job-service"
              value={params.service ?? ''}
              onChange={(e) => update({ service: e.target.value })}
              className={fieldClass}
            >
              <option value="">Any service</option>
              {SERVICE_TYPES.map((s) => (
                <option key={s} value={s}>
                  {SERVICE_LABELS[s]}
                </option>
              ))}
            </select>
          </div>
        </div>
        <div className="flex flex-wrap items-end gap-x-6 gap-y-4">
          <fieldset>
            <legend className={labelClass}>State</legend>
            <div className="mt-1 flex flex-wrap gap-2">
              {JOB_STATES.map((s) => (
                <button
                  key={s}
                  type="button"
                  aria-pressed={states.includes(s)}
                  onClick={() => toggleState(s)}
                  className="inline-flex min-h-11 items-center rounded-full border border-slate-400 bg-white px-4 font-medium text-slate-800 hover:bg-sand-100 aria-pressed:border-sea-700 aria-pressed:bg-sea-700 aria-pressed:text-white"
                >
                  {JOB_STATE_LABELS[s]}
                </button>
              ))}
            </div>
          </fieldset>
          <div className="w-48">
            <label htmlFor="job-waiting" className={labelClass}>
              In state more than (days)
            </label>
            <input
              id="job-waiting"
              type="number"
              inputMode="numeric"
              min={1}
              max={365}
              value={params.waitingDays ?? ''}
              onChange={(e) => update({ waitingDays: e.target.value })}
              className={fieldClass}
            />
          </div>
          <div className="flex gap-3">
            <div>
              <label htmlFor="job-from" className={labelClass}>
                Checked in from
              </label>
              <input
                id="job-from"
                type="date"
                value={params.from ?? ''}
                onChange={(e) => update({ from: e.target.value })}
                className={fieldClass}
              />
            </div>
            <div>
              <label htmlFor="job-to" className={labelClass}>
                to
              </label>
              <input
                id="job-to"
                type="date"
                value={params.to ?? ''}
                onChange={(e) => update({ to: e.target.value })}
                className={fieldClass}
              />
            </div>
          </div>
          {filtered && (
            <button
              type="button"
              onClick={() => {
                setText('');
                router.replace(pathname, { scroll: false });
              }}
              className="inline-flex min-h-12 items-center rounded-md px-3 font-medium text-sea-700 underline underline-offset-2 hover:bg-sea-50"
            >
              Clear filters
            </button>
          )}
        </div>
      </form>

      <div className="flex flex-wrap items-center justify-between gap-3 px-5 py-3">
        <p aria-live="polite" className="text-slate-700">
          {invalidQuery ? (
            <span role="alert" className="text-brick-700">
              This link has filters the list cannot read ({invalidQuery.join(', ')}).{' '}
              <Link href={pathname} className="font-medium underline">
                Show all jobs
              </Link>
            </span>
          ) : isError ? (
            <span role="alert" className="text-brick-700">
              Could not load jobs: {error.message}
            </span>
          ) : data ? (
            <>
              {total === 0
                ? 'No jobs'
                : `${formatCount(first)}–${formatCount(last)} of ${formatCount(total)} jobs`}
              {isFetching && <span className="ml-2 text-slate-600">Updating…</span>}
            </>
          ) : (
            'Loading jobs…'
          )}
        </p>
      </div>

      <div className="overflow-x-auto">
        <table className="w-full min-w-[56rem] text-left" aria-busy={isFetching}>
          <caption className="sr-only">Jobs; select a column heading to sort by it</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr
                key={group.id}
                className="border-y border-sand-300 bg-sand-50 text-sm text-slate-700"
              >
                {group.headers.map((header) => {
                  const numeric = (
                    header.column.columnDef.meta as { numeric?: boolean } | undefined
                  )?.numeric;
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
                          onClick={() => sortBy(header.column.id)}
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
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)
                    ?.numeric;
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
        {data && data.jobs.length === 0 && (
          <Empty>
            {filtered ? 'No jobs match these filters.' : 'No jobs yet. Check a reel in to start.'}
          </Empty>
        )}
      </div>

      <nav
        aria-label="Pages"
        className="flex flex-wrap items-center justify-between gap-4 border-t border-sand-200 px-5 py-4"
      >
        <div className="flex items-center gap-2">
          <label htmlFor="job-page-size" className="text-slate-700">
            Rows per page
          </label>
          <select
            id="job-page-size"
            value={pageSize}
            onChange={(e) =>
              update({ pageSize: e.target.value === '25' ? undefined : e.target.value })
            }
            className="min-h-11 rounded-md border border-slate-400 bg-white px-2"
          >
            {PAGE_SIZES.map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        </div>
        <div className="flex items-center gap-3">
          <span className="text-slate-700 tabular-nums">
            Page {formatCount(page)} of {formatCount(pageCount)}
          </span>
          <button
            type="button"
            disabled={page <= 1}
            onClick={() => update({ page: page - 1 > 1 ? String(page - 1) : undefined }, true)}
            className="inline-flex min-h-12 items-center rounded-md border border-slate-400 bg-white px-4 font-medium hover:bg-sand-100 disabled:opacity-50"
          >
            Previous
          </button>
          <button
            type="button"
            disabled={!table.getCanNextPage()}
            onClick={() => update({ page: String(page + 1) }, true)}
            className="inline-flex min-h-12 items-center rounded-md border border-slate-400 bg-white px-4 font-medium hover:bg-sand-100 disabled:opacity-50"
          >
            Next
          </button>
        </div>
      </nav>
      {asOf && <p className="sr-only">Ages as of {new Date(asOf).toLocaleString('en-US')}</p>}
    </div>
  );
}
