import { formatCount, formatInZone } from '~/lib/format';
import type { ImportHistoryRow } from '~/server/imports/history';

const STATUS_TEXT: Record<ImportHistoryRow['status'], string> = {
  validating: 'Checking',
  importing: 'Importing',
  imported: 'Imported',
  failed: 'Refused',
};

/** The shop's latest imports and what became of each. */
export function ImportHistory({ rows, timeZone }: { rows: ImportHistoryRow[]; timeZone: string }) {
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
