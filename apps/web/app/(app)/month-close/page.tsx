import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { monthCloseQuery } from '~/lib/queries/month-close';
import { month as monthSchema } from '~/lib/validators/month-close';
import { lastEndedMonth, monthLabel, shiftMonth } from '~/server/month-close/period';
import { paymentsConfigured } from '~/server/payments/stripe';
import { getMonthClose } from '~/server/queries/month-close';
import { requirePagePrincipal } from '~/server/session';
import { MonthCloseView } from './_components/month-close-view';
import * as clock from '~/server/clock';

export const metadata: Metadata = { title: 'Month close' };
export const dynamic = 'force-dynamic';

export default async function MonthClosePage(props: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'month-close:read')) return <NotAllowed />;
  const now = clock.now();
  const fallback = lastEndedMonth(now);
  const asked = (await props.searchParams).month;
  const parsed = monthSchema.safeParse(typeof asked === 'string' ? asked : fallback);
  const month = parsed.success ? parsed.data : fallback;
  const current = shiftMonth(fallback, 1);
  const months = Array.from({ length: 24 }, (_, i) => shiftMonth(current, -i)).map((m) => ({
    value: m,
    label: monthLabel(m),
  }));
  const queryClient = new QueryClient();
  queryClient.setQueryData(
    monthCloseQuery(month).queryKey,
    JSON.parse(JSON.stringify(await getMonthClose(principal, month, { now }))),
  );
  const manager = principal.scope.kind === 'region';
  return (
    <>
      <PageHeader
        title="Month close"
        lead={
          manager
            ? "Your region's figures and royalties for the month, shop by shop, each month taken in the shop's own time zone. Download them as CSV."
            : "Every shop's figures and royalties for the month, each month taken in the shop's own time zone. Close the month to freeze them, then issue the royalty invoices."
        }
      />
      {!parsed.success && (
        <p
          role="alert"
          className="mb-6 rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-amber-900"
        >
          That is not a month Reelwright knows; showing {monthLabel(month)} instead.
        </p>
      )}
      <HydrationBoundary state={dehydrate(queryClient)}>
        <MonthCloseView
          month={month}
          months={months}
          canManage={can(principal.role, 'month-close:manage')}
          paymentsReady={paymentsConfigured()}
        />
      </HydrationBoundary>
    </>
  );
}
