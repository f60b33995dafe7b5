'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { formatCount } from '~/lib/format';
import { shopsQuery } from '~/lib/queries/shops';

/** The shops in the caller's scope with their live counts, read through TanStack Query. */
export function ShopsTable({ caption }: { caption: string }) {
  const { data, isPending, isError, error } = useQuery(shopsQuery());
  if (isPending) return <p className="text-slate-600">Loading shops…</p>;
  if (isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load shops: {error.message}
      </p>
    );
  const shops = data.shops;
  const totals = shops.reduce(
    (t, s) => ({
      open: t.open + s.openJobs,
      waiting: t.waiting + s.waitingOnParts,
      ready: t.ready + s.readyForPickup,
      week: t.week + s.readyThisWeek,
    }),
    { open: 0, waiting: 0, ready: 0, week: 0 },
  );
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[40rem] text-left">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-sand-300 text-sm text-slate-600">
            <th scope="col" className="py-2 pr-4 font-medium">
              Shop
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Region
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Open jobs
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Waiting on parts
            </th>
            <th scope="col" className="num py-2 pr-4 font-medium">
              Ready for pickup
            </th>
            <th scope="col" className="num py-2 font-medium">
              Ready this week
            </th>
          </tr>
        </thead>
        <tbody>
          {shops.map((shop) => (
            <tr key={shop.id} className="border-b border-sand-100">
              <th scope="row" className="py-3 pr-4 font-medium">
                <Link
                  href={`/shops/${shop.id}`}
                  className="text-sea-700 underline-offset-2 hover:underline"
                >
                  {shop.name}
                </Link>
              </th>
              <td className="py-3 pr-4 text-slate-700">{shop.region.name}</td>
              <td className="num py-3 pr-4">{formatCount(shop.openJobs)}</td>
              <td className="num py-3 pr-4">{formatCount(shop.waitingOnParts)}</td>
              <td className="num py-3 pr-4">{formatCount(shop.readyForPickup)}</td>
              <td className="num py-3">{formatCount(shop.readyThisWeek)}</td>
            </tr>
          ))}
        </tbody>
        {shops.length > 1 && (
          <tfoot>
            <tr className="font-semibold">
              <th scope="row" colSpan={2} className="py-3 pr-4">
                All {shops.length} shops
              </th>
              <td className="num py-3 pr-4">{formatCount(totals.open)}</td>
              <td className="num py-3 pr-4">{formatCount(totals.waiting)}</td>
              <td className="num py-3 pr-4">{formatCount(totals.ready)}</td>
              <td className="num py-3">{formatCount(totals.week)}</td>
            </tr>
          </tfoot>
        )}
      </table>
    </div>
  );
}
