'use client';

import Papa from 'papaparse';
import { useMemo } from 'react';
import { formatCount } from '~/lib/format';
import type { ImportOutcome } from '~/lib/queries/imports';
import type { ImportRowError } from '~/lib/validators/imports';

const SHOWN_ERRORS = 200;

/** The problems a check found, by row, with all of them as a CSV to download. */
export function ErrorList(props: {
  errors: ImportRowError[];
  rowCount: number;
  onReset: () => void;
}) {
  const rowsWithErrors = useMemo(
    () => new Set(props.errors.map((e) => e.row)).size,
    [props.errors],
  );
  const download = () => {
    const csv = Papa.unparse(
      props.errors.map((e) => ({ row: e.row, column: e.column ?? '', problem: e.message })),
    );
    const url = URL.createObjectURL(new Blob([csv], { type: 'text/csv' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = 'import-problems.csv';
    a.click();
    URL.revokeObjectURL(url);
  };
  const shown = props.errors.slice(0, SHOWN_ERRORS);
  return (
    <div className="rounded-md border border-brick-300 bg-brick-50 p-4">
      <h3 className="text-lg font-semibold text-brick-900">
        Nothing was imported: {formatCount(props.errors.length)} problem
        {props.errors.length === 1 ? '' : 's'} in {formatCount(rowsWithErrors)} of{' '}
        {formatCount(props.rowCount)} rows
      </h3>
      <p className="mt-1 text-brick-900">
        Fix these rows in the file and choose it again. Row 2 is the first row under the headings,
        as a spreadsheet numbers it.
      </p>
      <div className="mt-3 max-h-[28rem] overflow-auto rounded border border-brick-200 bg-white">
        <table className="w-full text-left">
          <caption className="sr-only">Problems found in the file</caption>
          <thead className="sticky top-0 bg-white">
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <th scope="col" className="num px-3 py-2 font-medium">
                Row
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Column
              </th>
              <th scope="col" className="px-3 py-2 font-medium">
                Problem
              </th>
            </tr>
          </thead>
          <tbody>
            {shown.map((e, i) => (
              <tr key={`${e.row}-${e.column}-${i}`} className="border-b border-sand-100">
                <td className="num px-3 py-2">{e.row}</td>
                <td className="px-3 py-2 font-mono text-sm">{e.column ?? '—'}</td>
                <td className="px-3 py-2">{e.message}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="mt-3 flex flex-wrap items-center gap-4">
        {props.errors.length > SHOWN_ERRORS && (
          <p className="text-brick-900">
            Showing the first {SHOWN_ERRORS} of {formatCount(props.errors.length)}.
          </p>
        )}
        <button
          type="button"
          onClick={download}
          className="min-h-11 rounded-md border border-slate-400 bg-white px-4 font-medium text-slate-800 hover:bg-sand-100"
        >
          Download all problems (CSV)
        </button>
        <button
          type="button"
          onClick={props.onReset}
          className="min-h-11 rounded-md px-2 font-medium text-sea-800 underline"
        >
          Start again with another file
        </button>
      </div>
    </div>
  );
}

/** What became of an import the server took: imported, a duplicate, or failed. */
export function Outcome(props: {
  outcome: Exclude<ImportOutcome, { kind: 'rejected' }>;
  onReset: () => void;
}) {
  const o = props.outcome;
  if (o.kind === 'imported') {
    return (
      <div className="rounded-md border border-sea-300 bg-sea-50 p-4 text-sea-900">
        <h3 className="text-lg font-semibold">
          Imported {formatCount(o.summary.imported)} jobs from {o.summary.fileName}
        </h3>
        <p className="mt-1">
          {formatCount(o.summary.customersCreated)} new customers and{' '}
          {formatCount(o.summary.reelsCreated)} new reels; the rest were already known. Stored in{' '}
          {o.summary.seconds.toFixed(1)} s.
        </p>
        <div className="mt-3 flex flex-wrap gap-4">
          <a href="/bench" className="min-h-11 py-2.5 font-medium text-sea-800 underline">
            See the jobs on the bench
          </a>
          <button
            type="button"
            onClick={props.onReset}
            className="min-h-11 font-medium text-sea-800 underline"
          >
            Import another file
          </button>
        </div>
      </div>
    );
  }
  return (
    <div role="alert" className="rounded-md border border-brick-300 bg-brick-50 p-4 text-brick-900">
      <h3 className="text-lg font-semibold">
        {o.kind === 'duplicate' ? 'Already imported' : 'The import did not go through'}
      </h3>
      <p className="mt-1">{o.message}</p>
      <button
        type="button"
        onClick={props.onReset}
        className="mt-3 min-h-11 font-medium text-brick-900 underline"
      >
        Start again with another file
      </button>
    </div>
  );
}
