'use client';

import { formatCount } from '~/lib/format';
import type { ImportProgress } from '~/server/imports/jobs';
import { ErrorList, Outcome } from './import-results';
import { Progress, progressClass, Step } from './import-step';
import type { CsvImport, FileRead } from './use-csv-import';

const STORING_TEXT: Record<ImportProgress['step'], (p: ImportProgress) => string> = {
  customers: () => 'Storing customers and reels',
  jobs: (p) => `Storing jobs: ${formatCount(p.done)} of ${formatCount(p.total)}`,
  timeline: (p) => `Writing the timelines of ${formatCount(p.total)} jobs`,
};

/** Step 4: check every row in the browser, then import them all, with progress and the result. */
export function CheckStep({ csv, read }: { csv: CsvImport; read: FileRead }) {
  const { phase } = csv;
  return (
    <Step number={4} title="Check and import">
      {csv.missingRequired.length > 0 && (
        <p className="mb-4 text-brick-800">
          Still to match: {csv.missingRequired.map((f) => f.label).join(', ')}.
        </p>
      )}
      <div
        className={`flex flex-wrap items-center gap-3 ${phase.kind === 'finished' ? 'hidden' : ''}`}
      >
        <button
          type="button"
          onClick={csv.check}
          disabled={csv.busy || csv.missingRequired.length > 0}
          className="min-h-11 rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:cursor-not-allowed disabled:border-slate-300 disabled:text-slate-500"
        >
          Check {formatCount(read.rows.length)} rows
        </button>
        {phase.kind === 'checked' && phase.errors.length === 0 && (
          <button
            type="button"
            onClick={csv.send}
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
              <progress aria-label="The server is checking every row" className={progressClass} />
            </div>
          ))}
        {phase.kind === 'storing' && (
          <Progress
            label={STORING_TEXT[phase.progress.step](phase.progress)}
            fraction={phase.progress.fraction}
          />
        )}
      </div>

      <div ref={csv.resultRef} tabIndex={-1} className="mt-4 outline-none">
        {phase.kind === 'checked' && phase.errors.length === 0 && (
          <p className="rounded-md border border-sea-200 bg-sea-50 px-4 py-3 text-sea-900">
            All {formatCount(phase.rowCount)} rows look right. Importing adds them all in one go; if
            anything goes wrong, none are added.
          </p>
        )}
        {phase.kind === 'checked' && phase.errors.length > 0 && (
          <ErrorList errors={phase.errors} rowCount={phase.rowCount} onReset={csv.reset} />
        )}
        {phase.kind === 'finished' && <Outcome outcome={phase.outcome} onReset={csv.reset} />}
      </div>
    </Step>
  );
}
