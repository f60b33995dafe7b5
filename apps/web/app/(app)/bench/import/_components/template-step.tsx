import { IMPORT_FIELDS } from '~/lib/import-columns';
import { Step } from './import-step';

/** Step 1: the template to download, and what each of its columns means. */
export function TemplateStep(props: { shopName: string; timeZone: string }) {
  return (
    <Step number={1} title="Start from the template">
      <p className="text-slate-700">
        The template has a column for each field and two example rows; replace them with your jobs.
        Times are in {props.shopName}&apos;s time ({props.timeZone.replace('_', ' ')}) unless they
        carry an offset. Amounts are in dollars and cents.
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
  );
}
