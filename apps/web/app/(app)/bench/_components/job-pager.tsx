'use client';

import { formatCount } from '~/lib/format';
import { PAGE_SIZES } from '~/lib/jobs';

const pageButton =
  'inline-flex min-h-12 items-center rounded-md border border-slate-400 bg-white px-4 font-medium hover:bg-sand-100 disabled:opacity-50';

/** Rows per page and previous / next; page 1 and 25 rows are left out of the URL. */
export function JobPager(props: {
  page: number;
  pageCount: number;
  pageSize: number;
  canNext: boolean;
  update: (changes: Record<string, string | undefined>, keepPage?: boolean) => void;
}) {
  const { page, update } = props;
  return (
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
          value={props.pageSize}
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
          Page {formatCount(page)} of {formatCount(props.pageCount)}
        </span>
        <button
          type="button"
          disabled={page <= 1}
          onClick={() => update({ page: page - 1 > 1 ? String(page - 1) : undefined }, true)}
          className={pageButton}
        >
          Previous
        </button>
        <button
          type="button"
          disabled={!props.canNext}
          onClick={() => update({ page: String(page + 1) }, true)}
          className={pageButton}
        >
          Next
        </button>
      </div>
    </nav>
  );
}
