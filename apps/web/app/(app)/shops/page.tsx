import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can } from '~/lib/permissions';
import { shopsQuery } from '~/lib/queries/shops';
import { listShops } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { ShopsTable } from '../_components/shops-table';

export const metadata: Metadata = { title: 'Shops' };
export const dynamic = 'force-dynamic';

export default async function ShopsPage() {
  const principal = await requirePagePrincipal();
  if (principal.scope.kind === 'shop') redirect(`/shops/${principal.scope.shopId}`);
  if (!can(principal.role, 'network:read')) return <NotAllowed />;
  const queryClient = new QueryClient();
  queryClient.setQueryData(shopsQuery().queryKey, { shops: await listShops(principal) });
  return (
    <>
      <PageHeader title="Shops" lead="Every shop in your view. Select one for its page." />
      <Panel title="Shops and their open work">
        <HydrationBoundary state={dehydrate(queryClient)}>
          <ShopsTable caption="Shops and their open work" />
        </HydrationBoundary>
      </Panel>
    </>
  );
}
