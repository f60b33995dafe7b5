import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { comebackSettingsQuery } from '~/lib/queries/comebacks';
import { comebackSettingsView } from '~/server/comebacks/settings';
import { requirePagePrincipal } from '~/server/session';
import { ComebackSettingsForm } from './_components/comeback-settings-form';

export const metadata: Metadata = { title: 'Comeback settings' };
export const dynamic = 'force-dynamic';

export default async function ComebackSettingsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'settings:manage')) return <NotAllowed />;
  const queryClient = new QueryClient();
  queryClient.setQueryData(comebackSettingsQuery().queryKey, await comebackSettingsView());
  return (
    <>
      <p className="mb-2">
        <Link href="/settings" className="text-sea-700 underline underline-offset-2">
          ← Settings
        </Link>
      </p>
      <PageHeader
        title="Comebacks"
        lead="The warranty window that flags a returning reel, how long a shop has to review it, which attributions count against a shop, and the root causes reviewers choose from."
      />
      <HydrationBoundary state={dehydrate(queryClient)}>
        <ComebackSettingsForm />
      </HydrationBoundary>
    </>
  );
}
