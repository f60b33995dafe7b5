import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader } from '~/components/ui';
import { idParam } from '~/lib/validators/common';
import { can } from '~/lib/permissions';
import { ApiError } from '~/server/errors';
import { requirePagePrincipal } from '~/server/session';
import { shopCalendarView } from '~/server/shops/calendar';
import { ShopCalendarForm } from './_components/shop-calendar-form';

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
  return (
    <>
      <p className="mb-2">
        <Link href="/settings" className="text-sea-700 underline underline-offset-2">
          ← Settings
        </Link>
      </p>
      <PageHeader
        title={`${calendar.shop.name}: opening hours`}
        lead={`Business-time turnaround counts only the time the shop is open, in its own zone (${calendar.shop.timeZone}). Saving computes the turnaround of every job the shop has finished again on these hours, and the network figures follow.`}
      />
      <ShopCalendarForm initial={calendar} />
    </>
  );
}
