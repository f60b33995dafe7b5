import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { comebackListQuery } from '~/lib/queries/comebacks';
import { idParam } from '~/lib/validators/common';
import { COMEBACK_STATUSES } from '~/lib/comebacks';
import { type ComebackListQuery } from '~/lib/validators/comebacks';
import { ApiError } from '~/server/errors';
import { listComebacks } from '~/server/queries/comebacks';
import { requirePagePrincipal } from '~/server/session';
import { ComebackQueue, type StatusFilter } from './_components/comeback-queue';

export const metadata: Metadata = { title: 'Comebacks' };
export const dynamic = 'force-dynamic';

export default async function ComebacksPage(props: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'comebacks:read')) return <NotAllowed />;
  const search = await props.searchParams;
  const rawStatus = typeof search.status === 'string' ? search.status : 'open';
  const status: StatusFilter =
    rawStatus === 'all' || (COMEBACK_STATUSES as readonly string[]).includes(rawStatus)
      ? (rawStatus as StatusFilter)
      : 'open';
  const shop = idParam.safeParse(search.shop);
  const query: ComebackListQuery = {
    status: status === 'all' ? undefined : status,
    shop: shop.success ? shop.data : undefined,
  };
  const queryClient = new QueryClient();
  try {
    queryClient.setQueryData(
      comebackListQuery(query).queryKey,
      await listComebacks(principal, query),
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  const lead =
    principal.role === 'technician'
      ? 'Reels that came back inside the warranty window after your shop’s work. Your shop lead reviews each one to a root cause.'
      : principal.role === 'shop_lead'
        ? 'Reels that came back inside the warranty window after your shop’s work, wherever they came back. Review each one to a root cause and a disposition, oldest first.'
        : 'The review queues of your shops: each comeback belongs to the shop that did the original work. Open reviews oldest first.';
  return (
    <>
      <PageHeader title="Comebacks" lead={lead} />
      <HydrationBoundary state={dehydrate(queryClient)}>
        <ComebackQueue status={status} shop={query.shop} />
      </HydrationBoundary>
    </>
  );
}
