import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { dueRemindersQuery, reminderBatchesQuery } from '~/lib/queries/reminders';
import { REMINDER_WEEKS } from '~/lib/reminders';
import { dueReminders } from '~/server/reminders/due';
import { recentBatches } from '~/server/reminders/send';
import { seasonDate } from '~/server/reminders/template';
import { requirePagePrincipal } from '~/server/session';
import { RemindersView } from './_components/reminders-view';

export const metadata: Metadata = { title: 'Reminders' };
export const dynamic = 'force-dynamic';

export default async function RemindersPage(props: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'reminders:send') || principal.shopId == null) return <NotAllowed />;
  const shopId = principal.shopId;
  const asked = Number((await props.searchParams).weeks);
  const weeks = (REMINDER_WEEKS as readonly number[]).includes(asked) ? asked : 4;
  const queryClient = new QueryClient();
  const [due, batches] = await Promise.all([
    dueReminders(principal, shopId, weeks),
    recentBatches(principal, shopId),
  ]);
  const json = <T,>(value: T) => JSON.parse(JSON.stringify(value));
  queryClient.setQueryData(dueRemindersQuery(shopId, weeks).queryKey, json(due));
  queryClient.setQueryData(reminderBatchesQuery(shopId).queryKey, json({ batches }));
  return (
    <>
      <PageHeader
        title="Service reminders"
        lead={`Bring ${due.shop.name}'s customers back before the season. Light-use reels are due a year after their last service; heavy-use reels at the start, middle and end of the season (${seasonDate(due.shop.seasonStart)} to ${seasonDate(due.shop.seasonEnd)}, a shop setting).`}
      />
      <HydrationBoundary state={dehydrate(queryClient)}>
        <RemindersView shopId={shopId} initialWeeks={weeks} />
      </HydrationBoundary>
    </>
  );
}
