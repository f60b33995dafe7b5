'use client';

import { IMPORT_FIELDS } from '~/lib/import-columns';
import { Step } from './import-step';
import type { CsvImport, FileRead } from './use-csv-import';

/** Step 3: which column of the file holds each Reelwright field (guessed from the headings). */
export function ColumnMappingStep({
  id,
  csv,
  read,
}: {
  id: string;
  csv: CsvImport;
  read: FileRead;
}) {
  const { mapping } = csv;
  return (
    <Step number={3} title="Match the columns">
      <p className="text-slate-700">
        For each Reelwright field, pick the column of your file that holds it. Fields marked{' '}
        <span className="text-brick-700">*</span> are needed.
      </p>
      <details
        open={csv.showMapping}
        onToggle={(e) => csv.setShowMapping(e.currentTarget.open)}
        className="mt-3"
      >
        <summary className="min-h-11 cursor-pointer py-2.5 font-medium text-sea-800">
          {csv.matchedCount} of {IMPORT_FIELDS.length} fields matched from the file’s headings
          {csv.missingRequired.length ? '' : ' — every needed one'}
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
                disabled={csv.busy}
                onChange={(e) => csv.matchColumn(f.key, e.target.value)}
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
  );
}
