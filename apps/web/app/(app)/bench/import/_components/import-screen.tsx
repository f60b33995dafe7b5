'use client';

import { useQuery, useQueryClient } from '@tanstack/react-query';
import Papa from 'papaparse';
import { useId, useMemo, useRef, useState, type ChangeEvent, type ReactNode } from 'react';
import { formatCount, formatInZone } from '~/lib/format';
import {
  importHistoryQuery,
  importKeys,
  sendImport,
  type ImportOutcome,
} from '~/lib/queries/imports';
import {
  guessMapping,
  IMPORT_FIELDS,
  IMPORT_MAX_BYTES,
  IMPORT_MAX_ROWS,
  rowShapeErrors,
  validateImportRows,
  type ImportField,
  type ImportRowError,
} from '~/lib/validators/imports';
import type { ImportHistoryRow } from '~/server/imports/history';
import type { ImportProgress } from '~/server/imports/jobs';

interface FileRead {
  file: File;
  headers: string[];
  rows: Record<string, string>[];
}

type Phase =
  | { kind: 'idle' }
  | { kind: 'reading'; fraction: number; rows: number }
  | { kind: 'read-failed'; message: string }
  | { kind: 'checking'; done: number; total: number }
  | { kind: 'checked'; errors: ImportRowError[]; rowCount: number }
  | { kind: 'sending'; fraction: number }
  | { kind: 'storing'; progress: ImportProgress }
  | { kind: 'finished'; outcome: Exclude<ImportOutcome, { kind: 'rejected' }> };

const STORING_TEXT: Record<ImportProgress['step'], (p: ImportProgress) => string> = {
  customers: () => 'Storing customers and reels',
  jobs: (p) => `Storing jobs: ${formatCount(p.done)} of ${formatCount(p.total)}`,
  timeline: (p) => `Writing the timelines of ${formatCount(p.total)} jobs`,
};

const SLICE = 2_000;
const SHOWN_ERRORS = 200;
const nextFrame = () => new Promise((resolve) => setTimeout(resolve, 0));

/** Reading, mapping, checking and sending a CSV of past jobs, each step with its progress. */
export function ImportScreen(props: {
  shopName: string;
  timeZone: string;
  history: ImportHistoryRow[];
}) {
  const id = useId();
  const queryClient = useQueryClient();
  const [read, setRead] = useState<FileRead | null>(null);
  const [mapping, setMapping] = useState<Partial<Record<ImportField, string>>>({});
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const resultRef = useRef<HTMLDivElement>(null);
  const history = useQuery({ ...importHistoryQuery(), initialData: { imports: props.history } });

  const busy = ['reading', 'checking', 'sending', 'storing'].includes(phase.kind);
  const missingRequired = IMPORT_FIELDS.filter((f) => f.required && !mapping[f.key]);
  const matchedCount = IMPORT_FIELDS.filter((f) => mapping[f.key]).length;
  // The matching stays folded away when the headings already name every needed field.
  const [showMapping, setShowMapping] = useState(false);

  const focusResult = () => setTimeout(() => resultRef.current?.focus(), 0);

  const onFile = (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    setRead(null);
    if (!file) return setPhase({ kind: 'idle' });
    if (file.size > IMPORT_MAX_BYTES) {
      return setPhase({
        kind: 'read-failed',
        message: `${file.name} is larger than 50 MB. Split it into smaller files.`,
      });
    }
    const rows: Record<string, string>[] = [];
    let headers: string[] = [];
    setPhase({ kind: 'reading', fraction: 0, rows: 0 });
    Papa.parse<Record<string, string>>(file, {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (h) => h.trim(),
      chunkSize: 512 * 1024,
      chunk: (results) => {
        headers = results.meta.fields ?? headers;
        for (const r of results.data) rows.push(r);
        setPhase({
          kind: 'reading',
          fraction: Math.min(1, results.meta.cursor / file.size),
          rows: rows.length,
        });
      },
      complete: () => {
        if (rows.length === 0) {
          return setPhase({
            kind: 'read-failed',
            message: `${file.name} has no rows under its headings.`,
          });
        }
        if (rows.length > IMPORT_MAX_ROWS) {
          return setPhase({
            kind: 'read-failed',
            message: `${file.name} has ${formatCount(rows.length)} rows; import at most ${formatCount(IMPORT_MAX_ROWS)} at a time.`,
          });
        }
        const guessed = guessMapping(headers);
        setRead({ file, headers, rows });
        setMapping(guessed);
        setShowMapping(IMPORT_FIELDS.some((f) => f.required && !guessed[f.key]));
        setPhase({ kind: 'idle' });
      },
      error: (error) =>
        setPhase({ kind: 'read-failed', message: `The file could not be read: ${error.message}` }),
    });
  };

  const check = async () => {
    if (!read) return;
    const total = read.rows.length;
    const errors: ImportRowError[] = [];
    const seenRefs = new Map<string, number>();
    const now = new Date();
    // In slices, so the page stays responsive and shows progress on a 50,000-row file.
    for (let start = 0; start < total; start += SLICE) {
      setPhase({ kind: 'checking', done: start, total });
      await nextFrame();
      const slice = read.rows.slice(start, start + SLICE).map((record) => {
        const row: Partial<Record<ImportField, string>> = {};
        for (const [field, header] of Object.entries(mapping) as [ImportField, string][]) {
          row[field] = record[header] ?? '';
        }
        return row;
      });
      const result = validateImportRows(slice, {
        timeZone: props.timeZone,
        now,
        mapping,
        rowOffset: start,
        seenRefs,
      });
      errors.push(
        ...result.errors,
        ...rowShapeErrors(read.rows.slice(start, start + SLICE), read.headers, start),
      );
    }
    errors.sort((a, b) => a.row - b.row);
    setPhase({ kind: 'checked', errors, rowCount: total });
    focusResult();
  };

  const send = async () => {
    if (!read) return;
    setPhase({ kind: 'sending', fraction: 0 });
    const outcome = await sendImport(read.file, mapping, {
      onUpload: (fraction) => setPhase({ kind: 'sending', fraction }),
      onStored: (progress) => setPhase({ kind: 'storing', progress }),
    });
    setPhase(
      outcome.kind === 'rejected'
        ? { kind: 'checked', errors: outcome.errors, rowCount: outcome.rowCount }
        : { kind: 'finished', outcome },
    );
    await queryClient.invalidateQueries({ queryKey: importKeys.history });
    if (outcome.kind === 'imported') await queryClient.invalidateQueries({ queryKey: ['jobs'] });
    focusResult();
  };

  const reset = () => {
    setRead(null);
    setMapping({});
    setPhase({ kind: 'idle' });
  };

  return (
    <div className="space-y-6">
      <Step number={1} title="Start from the template">
        <p className="text-slate-700">
          The template has a column for each field and two example rows; replace them with your
          jobs. Times are in {props.shopName}&apos;s time ({props.timeZone.replace('_', ' ')})
          unless they carry an offset. Amounts are in dollars and cents.
        </p>
        <div className="mt-4 flex flex-wrap items-center gap-4">
          <a
            href="/api/imports/jobs/template"
            download
            className="inline-flex min-h-11 items-center rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50"
          >
            Download the CSV template
          </a>
          <details className="min-w-0 flex-1">
            <summary className="min-h-11 cursor-pointer py-2.5 font-medium text-sea-800">
              What each column means
            </summary>
            <div className="mt-2 overflow-x-auto">
              <table className="w-full min-w-[40rem] text-left text-sm">
                <caption className="sr-only">Columns of the job import</caption>
                <thead>
                  <tr className="border-b border-sand-300 text-slate-600">
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Column
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Meaning
                    </th>
                    <th scope="col" className="py-2 font-medium">
                      Example
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {IMPORT_FIELDS.map((f) => (
                    <tr key={f.key} className="border-b border-sand-100 align-top">
                      <th scope="row" className="py-2 pr-4 font-mono font-normal">
                        {f.key}
                        {f.required && <span className="ml-1 font-sans text-brick-700">*</span>}
                      </th>
                      <td className="py-2 pr-4">
                        {f.label}
                        {f.required ? ' (required)' : ''}
                        {'hint' in f && f.hint ? `. ${f.hint}` : ''}
                      </td>
                      <td className="py-2 font-mono">{f.example}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </details>
        </div>
      </Step>

      <Step number={2} title="Choose the CSV file">
        <label htmlFor={`${id}-file`} className="block font-medium text-slate-800">
          CSV file of past jobs
        </label>
        <input
          id={`${id}-file`}
          type="file"
          accept=".csv,text/csv"
          onChange={onFile}
          disabled={busy}
          aria-describedby={`${id}-file-hint`}
          className="mt-2 block w-full max-w-xl rounded-md border border-slate-400 bg-white p-2 file:mr-4 file:min-h-9 file:rounded file:border-0 file:bg-sea-700 file:px-3 file:font-medium file:text-white"
        />
        <p id={`${id}-file-hint`} className="mt-2 text-sm text-slate-600">
          Up to {formatCount(IMPORT_MAX_ROWS)} rows or 50 MB; the first row holds the headings.
        </p>
        <div role="status" className="mt-3">
          {phase.kind === 'reading' && (
            <Progress
              label={`Reading the file: ${formatCount(phase.rows)} rows so far`}
              fraction={phase.fraction}
            />
          )}
          {read && phase.kind !== 'reading' && (
            <p className="text-slate-800">
              <span className="font-medium">{read.file.name}</span>: {formatCount(read.rows.length)}{' '}
              rows, {read.headers.length} columns.
            </p>
          )}
        </div>
        {phase.kind === 'read-failed' && (
          <p role="alert" className="mt-3 text-brick-800">
            {phase.message}
          </p>
        )}
      </Step>

      {read && (
        <Step number={3} title="Match the columns">
          <p className="text-slate-700">
            For each Reelwright field, pick the column of your file that holds it. Fields marked{' '}
            <span className="text-brick-700">*</span> are needed.
          </p>
          <details
            open={showMapping}
            onToggle={(e) => setShowMapping(e.currentTarget.open)}
            className="mt-3"
          >
            <summary className="min-h-11 cursor-pointer py-2.5 font-medium text-sea-800">
              {matchedCount} of {IMPORT_FIELDS.length} fields matched from the file’s headings
              {missingRequired.length ? '' : ' — every needed one'}
            </summary>
            <div className="mt-2 grid gap-x-6 gap-y-3 sm:grid-cols-2 xl:grid-cols-3">
              {IMPORT_FIELDS.map((f) => (
                <div key={f.key}>
                  <label
                    htmlFor={`${id}-map-${f.key}`}
                    className="block text-sm font-medium text-slate-800"
                  >
                    {f.label}
                    {f.required && (
                      <>
                        <span aria-hidden="true" className="ml-1 text-brick-700">
                          *
                        </span>
                        <span className="sr-only"> (required)</span>
                      </>
                    )}
                  </label>
                  <select
                    id={`${id}-map-${f.key}`}
                    value={mapping[f.key] ?? ''}
                    disabled={busy}
                    onChange={(e) => {
                      const header = e.target.value;
                      setMapping((m) => {
                        const next = { ...m };
                        if (header) next[f.key] = header;
                        else delete next[f.key];
                        return next;
                      });
                      if (phase.kind === 'checked') setPhase({ kind: 'idle' });
                    }}
                    className={`mt-1 min-h-11 w-full rounded-md border bg-white px-2 ${
                      f.required && !mapping[f.key] ? 'border-brick-600' : 'border-slate-400'
                    }`}
                  >
                    <option value="">— not in the file —</option>
                    {read.headers.map((h) => (
                      <option key={h} value={h}>
                        {h}
                      </option>
                    ))}
                  </select>
                </div>
              ))}
            </div>
          </details>
        </Step>
      )}

      {read && (
        <Step number={4} title="Check and import">
          {missingRequired.length > 0 && (
            <p className="mb-4 text-brick-800">
              Still to match: {missingRequired.map((f) => f.label).join(', ')}.
            </p>
          )}
          <div
            className={`flex flex-wrap items-center gap-3 ${phase.kind === 'finished' ? 'hidden' : ''}`}
          >
            <button
              type="button"
              onClick={check}
              disabled={busy || missingRequired.length > 0}
              className="min-h-11 rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:cursor-not-allowed disabled:border-slate-300 disabled:text-slate-500"
            >
              Check {formatCount(read.rows.length)} rows
            </button>
            {phase.kind === 'checked' && phase.errors.length === 0 && (
              <button
                type="button"
                onClick={send}
                className="min-h-11 rounded-md bg-sea-700 px-4 font-semibold text-white hover:bg-sea-800"
              >
                Import {formatCount(read.rows.length)} jobs
              </button>
            )}
          </div>

          <div className="mt-4" role="status">
            {phase.kind === 'checking' && (
              <Progress
                label={`Checking rows: ${formatCount(phase.done)} of ${formatCount(phase.total)}`}
                fraction={phase.done / phase.total}
              />
            )}
            {phase.kind === 'sending' &&
              (phase.fraction < 1 ? (
                <Progress label="Sending the file" fraction={phase.fraction} />
              ) : (
                <div className="max-w-xl">
                  <p className="text-slate-800">The server is checking every row…</p>
                  <progress
                    aria-label="The server is checking every row"
                    className="mt-1 h-3 w-full appearance-none overflow-hidden rounded-full bg-sand-200 [&::-moz-progress-bar]:bg-sea-700 [&::-webkit-progress-bar]:bg-sand-200 [&::-webkit-progress-value]:bg-sea-700"
                  />
                </div>
              ))}
            {phase.kind === 'storing' && (
              <Progress
                label={STORING_TEXT[phase.progress.step](phase.progress)}
                fraction={phase.progress.fraction}
              />
            )}
          </div>

          <div ref={resultRef} tabIndex={-1} className="mt-4 outline-none">
            {phase.kind === 'checked' && phase.errors.length === 0 && (
              <p className="rounded-md border border-sea-200 bg-sea-50 px-4 py-3 text-sea-900">
                All {formatCount(phase.rowCount)} rows look right. Importing adds them all in one
                go; if anything goes wrong, none are added.
              </p>
            )}
            {phase.kind === 'checked' && phase.errors.length > 0 && (
              <ErrorList errors={phase.errors} rowCount={phase.rowCount} onReset={reset} />
            )}
            {phase.kind === 'finished' && <Outcome outcome={phase.outcome} onReset={reset} />}
          </div>
        </Step>
      )}

      <History rows={history.data.imports} timeZone={props.timeZone} />
    </div>
  );
}

function Step(props: { number: number; title: string; children: ReactNode }) {
  const headingId = `import-step-${props.number}`;
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <h2
        id={headingId}
        className="flex items-center gap-3 border-b border-sand-200 px-5 py-4 text-lg font-semibold text-slate-900"
      >
        <span
          aria-hidden="true"
          className="flex size-7 items-center justify-center rounded-full bg-sea-700 text-sm text-white"
        >
          {props.number}
        </span>
        {props.title}
      </h2>
      <div className="p-5">{props.children}</div>
    </section>
  );
}

function Progress(props: { label: string; fraction: number }) {
  const percent = Math.round(Math.max(0, Math.min(1, props.fraction)) * 100);
  return (
    <div className="max-w-xl">
      <div className="flex justify-between text-slate-800">
        <span>{props.label}</span>
        <span className="num">{percent}%</span>
      </div>
      <progress
        max={100}
        value={percent}
        aria-label={props.label}
        className="mt-1 h-3 w-full appearance-none overflow-hidden rounded-full bg-sand-200 [&::-moz-progress-bar]:bg-sea-700 [&::-webkit-progress-bar]:bg-sand-200 [&::-webkit-progress-value]:bg-sea-700"
      />
    </div>
  );
}

function ErrorList(props: { errors: ImportRowError[]; rowCount: number; onReset: () => void }) {
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

function Outcome(props: {
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

const STATUS_TEXT: Record<ImportHistoryRow['status'], string> = {
  validating: 'Checking',
  importing: 'Importing',
  imported: 'Imported',
  failed: 'Refused',
};

function History({ rows, timeZone }: { rows: ImportHistoryRow[]; timeZone: string }) {
  // In the shop's zone, so the server's and the browser's rendering agree.
  const when = (iso: string) => formatInZone(new Date(iso), timeZone, 'd MMM yyyy, HH:mm');
  return (
    <section
      aria-labelledby="import-history"
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <h2
        id="import-history"
        className="border-b border-sand-200 px-5 py-4 text-lg font-semibold text-slate-900"
      >
        Recent imports
      </h2>
      <div className="overflow-x-auto p-5">
        {rows.length === 0 ? (
          <p className="text-slate-600">No imports yet.</p>
        ) : (
          <table className="w-full min-w-[40rem] text-left">
            <caption className="sr-only">Recent imports at this shop</caption>
            <thead>
              <tr className="border-b border-sand-300 text-sm text-slate-600">
                <th scope="col" className="py-2 pr-4 font-medium">
                  File
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  When
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  By
                </th>
                <th scope="col" className="num py-2 pr-4 font-medium">
                  Rows
                </th>
                <th scope="col" className="py-2 font-medium">
                  Result
                </th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.id} className="border-b border-sand-100">
                  <th scope="row" className="py-2 pr-4 font-medium break-all">
                    {r.fileName}
                  </th>
                  <td className="py-2 pr-4 whitespace-nowrap">
                    <time dateTime={r.createdAt}>{when(r.createdAt)}</time>
                  </td>
                  <td className="py-2 pr-4">{r.by ?? '—'}</td>
                  <td className="num py-2 pr-4">{formatCount(r.rowCount ?? 0)}</td>
                  <td className="py-2">
                    {STATUS_TEXT[r.status]}
                    {r.status === 'imported' && `: ${formatCount(r.importedCount)} jobs`}
                    {r.status === 'failed' &&
                      `: ${formatCount(r.errorCount)} problem${r.errorCount === 1 ? '' : 's'}`}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
    </section>
  );
}
