'use client';

import Link from 'next/link';
import { useState } from 'react';
import type { ShopMetricsResult } from '~/server/queries/network';
import { DASH, formatCount } from '../../../network/_components/format';
import { formatDay, formatPeriod } from '../../../network/_components/periods';

const ATTRIBUTION_LABELS: Record<string, string> = {
  workmanship: 'Workmanship',
  part_failure: 'Part failure',
  customer_damage: 'Customer damage',
  unrelated: 'Unrelated',
  undetermined: 'Undetermined',
};
const STATUS_LABELS = { open: 'Awaiting review', confirmed: 'Confirmed', dismissed: 'Dismissed' };

const COMEBACKS_SHOWN = 12;

export function Comebacks({
  m,
  benchHref,
}: {
  m: ShopMetricsResult;
  benchHref: (id: number) => string;
}) {
  const [all, setAll] = useState(false);
  const rows = all ? m.comebacks : m.comebacks.slice(0, COMEBACKS_SHOWN);
  const period = formatPeriod(m.period.from, m.period.to);
  if (rows.length === 0) {
    return <p className="text-slate-600">No job collected in {period} has come back so far.</p>;
  }
  const byAttribution = new Map<string, number>();
  for (const r of m.comebacks) {
    const key = r.status === 'confirmed' ? (r.attribution ?? 'undetermined') : r.status;
    byAttribution.set(key, (byAttribution.get(key) ?? 0) + 1);
  }
  const summary = [...byAttribution.entries()]
    .sort((a, b) => b[1] - a[1])
    .map(
      ([k, n]) =>
        `${ATTRIBUTION_LABELS[k] ?? STATUS_LABELS[k as keyof typeof STATUS_LABELS] ?? k} ${n}`,
    )
    .join(' · ');
  return (
    <>
      <p className="mb-3 text-slate-700">
        {formatCount(m.comebacks.length)} return{m.comebacks.length === 1 ? '' : 's'}: {summary}.
        Those marked “counts” are the events of the comeback rate; latest first.
      </p>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[52rem] text-left">
          <caption className="sr-only">Comebacks of jobs collected in {period}</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <th scope="col" className="py-2 pr-3 font-medium">
                Return job
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Original job
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Came back
              </th>
              <th scope="col" className="num py-2 pr-3 font-medium">
                Days after collection
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Symptom
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Review
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Attribution and root cause
              </th>
              <th scope="col" className="py-2 font-medium">
                In the rate
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} className="border-b border-sand-100 align-top">
                <th scope="row" className="py-2 pr-3 font-medium">
                  <Link
                    href={benchHref(r.jobId)}
                    className="text-sea-700 underline-offset-2 hover:underline"
                  >
                    #{r.jobId}
                  </Link>
                </th>
                <td className="py-2 pr-3">
                  <Link
                    href={benchHref(r.originalJobId)}
                    className="text-sea-700 underline-offset-2 hover:underline"
                  >
                    #{r.originalJobId}
                  </Link>
                </td>
                <td className="py-2 pr-3 whitespace-nowrap">
                  {formatDay(r.detectedAt.slice(0, 10))}
                </td>
                <td className="num py-2 pr-3">{r.daysSinceCollection}</td>
                <td className="py-2 pr-3">{r.symptom ?? DASH}</td>
                <td className="py-2 pr-3">{STATUS_LABELS[r.status]}</td>
                <td className="py-2 pr-3">
                  {r.attribution ? ATTRIBUTION_LABELS[r.attribution] : DASH}
                  {r.rootCause && (
                    <span className="block text-sm text-slate-600">{r.rootCause}</span>
                  )}
                </td>
                <td className="py-2">{r.counted ? 'Counts' : 'Not counted'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {m.comebacks.length > COMEBACKS_SHOWN && (
        <button
          type="button"
          onClick={() => setAll(!all)}
          aria-expanded={all}
          className="mt-3 min-h-11 rounded-md border border-sea-700 px-4 font-medium text-sea-800 hover:bg-sea-50"
        >
          {all
            ? `Show the latest ${COMEBACKS_SHOWN}`
            : `Show all ${formatCount(m.comebacks.length)}`}
        </button>
      )}
    </>
  );
}
