import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { shopMetricsQuery, shopTrendsQuery } from '~/lib/queries/network';
import { idParam } from '~/lib/validators/common';
import { TREND_METRICS } from '~/lib/network';
import { ApiError } from '~/server/errors';
import { comebackBreakdown } from '~/server/queries/comebacks';
import { shopMetrics, shopTrends, visibleShop } from '~/server/queries/network';
import { requirePagePrincipal } from '~/server/session';
import {
  formatPeriod,
  lastWholeMonth,
  readViewParams,
  todayIn,
  trendWindow,
} from '../../network/_components/periods';
import { ComebackBreakdownPanel } from './_components/comeback-breakdown';
import { ShopView } from './_components/shop-view';
import * as clock from '~/server/clock';

export const metadata: Metadata = { title: 'Shop' };
export const dynamic = 'force-dynamic';

export default async function ShopPage(props: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'shops:read')) return <NotAllowed />;
  const id = idParam.safeParse((await props.params).id);
  if (!id.success) notFound();
  const asOf = clock.now();
  try {
    const { timeZone } = await visibleShop(principal, id.data);
    const today = todayIn(timeZone, asOf);
    const view = readViewParams(await props.searchParams, lastWholeMonth(today));
    const period = { from: view.from, to: view.to };
    const trend = trendWindow(period);
    const queryClient = new QueryClient();
    const metrics = await shopMetrics(principal, id.data, period, { asOf });
    queryClient.setQueryData(shopMetricsQuery(id.data, period).queryKey, metrics);
    for (const metric of TREND_METRICS) {
      queryClient.setQueryData(
        shopTrendsQuery(id.data, trend, metric).queryKey,
        await shopTrends(principal, id.data, { ...trend, metric }, { asOf }),
      );
    }
    const shop = metrics.figures.shop;
    const breakdown = await comebackBreakdown(principal, id.data, period, asOf);
    return (
      <>
        <PageHeader
          title={shop.name}
          lead={`${shop.region.name} · ${formatPeriod(view.from, view.to)} · times in ${shop.timeZone.replace('_', ' ')}`}
        />
        <HydrationBoundary state={dehydrate(queryClient)}>
          <ShopView
            shopId={id.data}
            period={period}
            trend={trend}
            today={today}
            invalid={view.invalid}
          />
        </HydrationBoundary>
        <ComebackBreakdownPanel shopId={id.data} data={breakdown} />
      </>
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
}
