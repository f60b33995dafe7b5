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
  lastWholeMonth,
  latestFinalQuarter,
  readViewParams,
  todayIn,
  trendWindow,
} from './_components/periods';
import * as clock from '~/server/clock';

export const metadata: Metadata = { title: 'Network' };
export const dynamic = 'force-dynamic';

export default async function NetworkPage(props: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'network:read')) return <NotAllowed />;
  const asOf = clock.now();
  const today = todayIn('America/New_York', asOf);
  const { warrantyDays } = await networkSettingsUsed();
  const search = await props.searchParams;
  // The last whole month: the latest with all its work in, judged by O/E while windows are open.
  const view = readViewParams(search, lastWholeMonth(today));
  const finalQuarter = latestFinalQuarter(today, warrantyDays);
  const defaultShown =
    search.from === undefined && search.to === undefined
      ? {
          finalQuarter: {
            from: finalQuarter.from,
            to: finalQuarter.to,
            label: `Q${(Number(finalQuarter.from.slice(5, 7)) + 2) / 3} ${finalQuarter.from.slice(0, 4)}`,
          },
        }
      : undefined;
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
            defaultShown={defaultShown}
          />
        </HydrationBoundary>
      </>
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
}
