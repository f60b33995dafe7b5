'use client';

import { useId } from 'react';
import { monthCsvHref, type MonthCloseData } from '~/lib/queries/month-close';
import { field, primary, secondary } from './controls';
import { utc } from './format';

/** The month picker, whether the month is closed or live, and the CSV download. */
export function MonthToolbar({
  month,
  months,
  report,
}: {
  month: string;
  months: { value: string; label: string }[];
  report: MonthCloseData;
}) {
  const id = useId();
  const close = report.close;
  return (
    <div className="flex flex-wrap items-end justify-between gap-4 rounded-lg border border-sand-200 bg-white p-5 shadow-sm">
      <form method="get" action="/month-close" className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-month`} className="text-sm font-medium text-slate-700">
            Month
          </label>
          <select id={`${id}-month`} name="month" defaultValue={month} className={field}>
            {months.map((m) => (
              <option key={m.value} value={m.value}>
                {m.label}
              </option>
            ))}
          </select>
        </div>
        <button type="submit" className={secondary}>
          Show
        </button>
      </form>
      <div className="flex flex-wrap items-center gap-4">
        <p className="text-slate-700" aria-live="polite">
          {close ? (
            <>
              <span className="mr-2 inline-flex items-center rounded-full bg-sea-700 px-2.5 py-0.5 text-sm font-medium text-white">
                Closed
              </span>
              {utc(close.closedAt)}
              {close.closedBy ? ` by ${close.closedBy}` : ''}
            </>
          ) : (
            <>
              <span className="mr-2 inline-flex items-center rounded-full bg-sand-100 px-2.5 py-0.5 text-sm font-medium text-slate-800 ring-1 ring-sand-300 ring-inset">
                Open
              </span>
              Live figures as of {utc(report.asOf)}
            </>
          )}
        </p>
        <a href={monthCsvHref(month)} download className={primary}>
          Download CSV
        </a>
      </div>
    </div>
  );
}
