import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader } from '~/components/ui';
import { idParam } from '~/lib/validators/common';
import { can } from '~/lib/permissions';
import { ApiError } from '~/server/errors';
import { requirePagePrincipal } from '~/server/session';
import { getShop } from '~/server/queries/shops';
import { listRegions, royaltyRates, shopCalendarView } from '~/server/shops';
import { ShopCalendarForm } from './_components/shop-calendar-form';
import { ShopDetailsForm } from './_components/shop-details-form';

export const metadata: Metadata = { title: 'Shop hours' };
export const dynamic = 'force-dynamic';

export default async function ShopHoursPage(props: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'settings:manage')) return <NotAllowed />;
  const id = idParam.safeParse((await props.params).id);
  if (!id.success) notFound();
  const calendar = await shopCalendarView(id.data).catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  });
  const [shop, regions, rates] = await Promise.all([
    getShop(principal, id.data),
    listRegions(),
    royaltyRates(id.data),
  ]);
  return (
    <>
      <p className="mb-2">
        <Link href="/settings/shops" className="text-sea-700 underline underline-offset-2">
          ← Shops and regions
        </Link>
      </p>
      <PageHeader
        title={`${calendar.shop.name}: opening hours`}
        lead={`Business-time turnaround counts only the time the shop is open, in its own zone (${calendar.shop.timeZone}). Saving computes the turnaround of every job the shop has finished again on these hours, and the network figures follow.`}
      />
      <div className="space-y-8">
        <ShopDetailsForm
          shop={{ ...shop, regionId: shop.region.id }}
          regions={regions.map((r) => ({ id: r.id, name: r.name }))}
          rates={rates}
        />
        <ShopCalendarForm initial={calendar} />
      </div>
    </>
  );
}
