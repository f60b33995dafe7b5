import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can } from '~/lib/permissions';
import { centsText, percentText } from '~/lib/money-input';
import { listShops } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { listRegions } from '~/server/shops';
import { OpenShopForm } from './_components/open-shop-form';
import { RegionForm } from './_components/region-form';

export const metadata: Metadata = { title: 'Shops and regions' };
export const dynamic = 'force-dynamic';

export default async function ShopsSettingsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'settings:manage')) return <NotAllowed />;
  const [shops, regions] = await Promise.all([listShops(principal), listRegions()]);
  return (
    <>
      <p className="mb-2">
        <Link href="/settings" className="text-sea-700 underline underline-offset-2">
          ← Settings
        </Link>
      </p>
      <PageHeader
        title="Shops and regions"
        lead="A closed shop takes no new jobs; its history stays, and so do its figures for the months it was open."
      />
      <div className="space-y-8">
        <Panel
          title="Shops"
          description={`${shops.filter((s) => s.active).length} open, ${shops.filter((s) => !s.active).length} closed.`}
        >
          <div className="overflow-x-auto">
            <table className="w-full min-w-[44rem] text-left">
              <caption className="sr-only">Shops</caption>
              <thead>
                <tr className="border-b border-sand-300 text-sm text-slate-600">
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Shop
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Region
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Time zone
                  </th>
                  <th scope="col" className="py-2 pr-4 text-right font-medium">
                    Labour / hour
                  </th>
                  <th scope="col" className="py-2 pr-4 text-right font-medium">
                    Royalty
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Status
                  </th>
                </tr>
              </thead>
              <tbody>
                {shops.map((s) => (
                  <tr key={s.id} className="border-b border-sand-100">
                    <th scope="row" className="py-2 pr-4 font-medium">
                      <Link
                        href={`/settings/shops/${s.id}`}
                        className="inline-flex min-h-11 items-center text-sea-700 underline underline-offset-2 hover:text-sea-900"
                      >
                        {s.name}
                      </Link>
                    </th>
                    <td className="py-2 pr-4">{s.region.name}</td>
                    <td className="py-2 pr-4">{s.timeZone}</td>
                    <td className="py-2 pr-4 text-right tabular-nums">
                      {centsText(s.labourRateCents)} {s.currency}
                    </td>
                    <td className="py-2 pr-4 text-right tabular-nums">
                      {percentText(s.royaltyRateBp)}%
                    </td>
                    <td className="py-2">{s.active ? 'Open' : 'Closed'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Panel>
        <Panel
          title="Open a shop"
          description="It starts with no jobs; it appears in the network view and the month close at once."
        >
          <OpenShopForm regions={regions.map((r) => ({ id: r.id, name: r.name }))} />
        </Panel>
        <Panel
          title="Regions"
          description="A regional manager looks after one region; choose the region on their page under People."
        >
          <ul className="mb-6 space-y-1">
            {regions.map((r) => (
              <li key={r.id}>
                <span className="font-medium">{r.name}</span>{' '}
                <span className="text-slate-600">
                  ({r.code}) · {r.shops} {r.shops === 1 ? 'shop' : 'shops'} ·{' '}
                  {r.managers.length ? r.managers.map((m) => m.name).join(', ') : 'no manager'}
                </span>
              </li>
            ))}
          </ul>
          <RegionForm />
        </Panel>
      </div>
    </>
  );
}
