'use client';

import { useQuery } from '@tanstack/react-query';
import { getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import Link from 'next/link';
import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import { useCallback, useEffect, useMemo, useState } from 'react';
import { Empty } from '~/components/ui';
import { formatCount } from '~/lib/format';
import { JOB_STATES, type JobState } from '~/lib/labels';
import { jobsPageQuery, listParams } from '~/lib/queries/jobs';
import type { JobSort } from '~/lib/jobs';
import { jobColumns, SORTABLE } from './job-columns';
import { JobFilters } from './job-filters';
import { JobPager } from './job-pager';
import { JobTable } from './job-table';

interface Props {
  shops: { id: number; name: string; timeZone: string }[];
  technicians: { id: number; name: string; shopId: number }[];
  /** Parameters of the URL that the schema refused, if any. */
  invalidQuery: string[] | null;
}

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
  // Past the count's cap the list says "more than", and one page more can always be asked for.
  const exact = data?.totalExact ?? true;
  const pageCount = Math.max(
    1,
    Math.ceil(total / pageSize) + (exact ? 0 : 1),
    exact ? 1 : page + 1,
  );
  const asOf = data?.asOf;

  const columns = useMemo(() => jobColumns(multiShop), [multiShop]);

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
  const last = (page - 1) * pageSize + (data?.jobs.length ?? 0);

  return (
    <div className="rounded-lg border border-sand-200 bg-white shadow-sm">
      <JobFilters
        params={params}
        update={update}
        text={text}
        setText={setText}
        shops={shops}
        technicians={shownTechnicians}
        states={states}
        toggleState={toggleState}
        filtered={filtered}
        onClear={() => {
          setText('');
          router.replace(pathname, { scroll: false });
        }}
      />

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
                : `${formatCount(first)}–${formatCount(last)} of ${exact ? '' : 'more than '}${formatCount(total)} jobs`}
              {isFetching && <span className="ml-2 text-slate-600">Updating…</span>}
            </>
          ) : (
            'Loading jobs…'
          )}
        </p>
      </div>

      <div className="overflow-x-auto">
        <JobTable table={table} sorting={sorting} sortBy={sortBy} busy={isFetching} />
        {data && data.jobs.length === 0 && (
          <Empty>
            {filtered ? 'No jobs match these filters.' : 'No jobs yet. Check a reel in to start.'}
          </Empty>
        )}
      </div>

      <JobPager
        page={page}
        pageCount={pageCount}
        pageSize={pageSize}
        canNext={table.getCanNextPage()}
        update={update}
      />
      {asOf && <p className="sr-only">Ages as of {new Date(asOf).toLocaleString('en-US')}</p>}
    </div>
  );
}
