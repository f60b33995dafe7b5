import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { correctiveActionsQuery } from '~/lib/queries/audits';
import { listCorrectiveActions } from '~/server/queries/corrective-actions';
import { requirePagePrincipal } from '~/server/session';
import { CorrectiveActionsList } from './_components/corrective-actions-list';

export const metadata: Metadata = { title: 'Corrective actions' };
export const dynamic = 'force-dynamic';

export default async function CorrectiveActionsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'corrective-actions:manage')) return <NotAllowed />;
  const queryClient = new QueryClient();
  queryClient.setQueryData(correctiveActionsQuery().queryKey, {
    correctiveActions: await listCorrectiveActions(principal),
  });
  const lead =
    principal.role === 'shop_lead'
      ? 'What your shop must put right after a rejected audit or a confirmed comeback. Move each action along and say what was done; your regional manager verifies it.'
      : 'Actions the shops must carry out after a rejected audit or a confirmed comeback. The shop lead moves each along; you verify it once done.';
  return (
    <>
      <PageHeader title="Corrective actions" lead={lead} />
      <HydrationBoundary state={dehydrate(queryClient)}>
        <CorrectiveActionsList />
      </HydrationBoundary>
    </>
  );
}
