import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { comparisonQuery, networkTrendsQuery } from '~/lib/queries/network';
import { TREND_METRICS } from '~/lib/network';
import { ApiError } from '~/server/errors';
import { networkComparison, networkSettingsUsed, networkTrends } from '~/server/queries/network';
import { requirePagePrincipal } from '~/server/session';
import { NetworkView } from './_components/network-view';
import {
  formatPeriod,
  latestFinalQuarter,
  readViewParams,
  todayIn,
  trendWindow,
} from './_components/periods';

export const metadata: Metadata = { title: 'Network' };
export const dynamic = 'force-dynamic';

export default async function NetworkPage(props: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'network:read')) return <NotAllowed />;
  const asOf = new Date();
  const today = todayIn('America/New_York', asOf);
  const { warrantyDays } = await networkSettingsUsed();
  const view = readViewParams(await props.searchParams, latestFinalQuarter(today, warrantyDays));
  const params = { from: view.from, to: view.to, region: view.region };
  const trendParams = { ...trendWindow(params), region: view.region };
  const queryClient = new QueryClient();
  try {
    const comparison = await networkComparison(principal, params, { asOf });
    queryClient.setQueryData(comparisonQuery(params).queryKey, comparison);
    for (const metric of TREND_METRICS) {
      queryClient.setQueryData(
        networkTrendsQuery(trendParams, metric).queryKey,
        await networkTrends(principal, { ...trendParams, metric }, { asOf }),
      );
    }
    const title =
      comparison.region?.name ??
      (principal.scope.kind === 'region' ? (comparison.regions[0]?.name ?? 'Network') : 'Network');
    return (
      <>
        <PageHeader
          title={
            principal.scope.kind === 'region' || comparison.region ? `${title} shops` : 'Network'
          }
          lead={`Which shop needs you, and for what, in ${formatPeriod(view.from, view.to)}. Each shop is judged against the whole network's rate for its own volume, so a small shop is not flagged for what chance alone explains.`}
        />
        <HydrationBoundary state={dehydrate(queryClient)}>
          <NetworkView
            params={params}
            trendParams={trendParams}
            today={today}
            invalid={view.invalid}
          />
        </HydrationBoundary>
      </>
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
}
