'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { Empty } from '~/components/ui';
import { roundsQuery } from '~/lib/queries/audits';
import { RoundStatusBadge, SeverityBadge } from './badges';
import { formatPeriod } from './format';

export function RoundsTable({ auditor }: { auditor: boolean }) {
  const { data, isPending, isError, error } = useQuery(roundsQuery());
  if (isPending) return <p className="text-slate-600">Loading rounds…</p>;
  if (isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load rounds: {error.message}
      </p>
    );
  if (!data.rounds.length)
    return <Empty>{auditor ? 'No rounds are assigned to you yet.' : 'No audit rounds yet.'}</Empty>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[52rem] text-left">
        <caption className="sr-only">Audit rounds</caption>
        <thead>
          <tr className="border-b border-sand-300 text-sm text-slate-600">
            <th scope="col" className="py-2 pr-4 font-medium">
              Round
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Shop and period
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Inspection
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Lot
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Sample
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Ac / Re
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Scored
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Status
            </th>
            {!auditor && (
              <th scope="col" className="py-2 font-medium">
                Auditor
              </th>
            )}
          </tr>
        </thead>
        <tbody>
          {data.rounds.map((r) => (
            <tr key={r.id} className="border-b border-sand-100">
              <th scope="row" className="py-3 pr-4 font-medium">
                <Link
                  href={`/audits/${r.id}`}
                  className="text-sea-700 underline underline-offset-2 hover:text-sea-900"
                >
                  Round #{r.id}
                </Link>
              </th>
              <td className="py-3 pr-4">
                <span className="block font-medium">{r.shop.name}</span>
                <span className="block text-sm text-slate-600">
                  {formatPeriod(r.periodStart, r.periodEnd)}
                </span>
              </td>
              <td className="py-3 pr-4">
                <SeverityBadge severity={r.severity} />
              </td>
              <td className="num py-3 pr-4">{r.lotSize}</td>
              <td className="num py-3 pr-4">{r.sampleSize}</td>
              <td className="num py-3 pr-4">
                {r.acceptNumber} / {r.rejectNumber}
              </td>
              <td className="num py-3 pr-4">
                {r.scored} of {r.sampleSize}
              </td>
              <td className="py-3 pr-4">
                <RoundStatusBadge status={r.status} decision={r.decision} />
              </td>
              {!auditor && <td className="py-3">{r.auditor?.name ?? '—'}</td>}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
