'use client';

import { formatCount } from '~/lib/format';
import { IMPORT_MAX_ROWS } from '~/lib/import-columns';
import { Progress, Step } from './import-step';
import type { CsvImport } from './use-csv-import';

/** Step 2: the file, read in the browser with its progress. */
export function FileStep({ id, csv }: { id: string; csv: CsvImport }) {
  const { phase, read } = csv;
  return (
    <Step number={2} title="Choose the CSV file">
      <label htmlFor={`${id}-file`} className="block font-medium text-slate-800">
        CSV file of past jobs
      </label>
      <input
        id={`${id}-file`}
        type="file"
        accept=".csv,text/csv"
        onChange={csv.onFile}
        disabled={csv.busy}
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
  );
}
