import { queryOptions } from '@tanstack/react-query';
import type {
  NetworkComparisonResult,
  ShopMetricsResult,
  TrendsResult,
} from '~/server/queries/network';
import { fetchJson } from '../api-client';
import type { TrendMetric } from '../validators/network';

export interface PeriodParams {
  from: string;
  to: string;
  region?: number;
}

const search = (params: Record<string, string | number | undefined>) =>
  new URLSearchParams(
    Object.entries(params)
      .filter(([, v]) => v !== undefined)
      .map(([k, v]) => [k, String(v)]),
  ).toString();

export const networkKeys = {
  all: ['network'] as const,
  comparison: (p: PeriodParams) =>
    ['network', 'comparison', p.from, p.to, p.region ?? null] as const,
  trends: (p: PeriodParams, metric: TrendMetric) =>
    ['network', 'trends', metric, p.from, p.to, p.region ?? null] as const,
  shopMetrics: (id: number, p: PeriodParams) => ['shops', id, 'metrics', p.from, p.to] as const,
  shopTrends: (id: number, p: PeriodParams, metric: TrendMetric) =>
    ['shops', id, 'trends', metric, p.from, p.to] as const,
};

export const comparisonQuery = (p: PeriodParams) =>
  queryOptions({
    queryKey: networkKeys.comparison(p),
    queryFn: () =>
      fetchJson<NetworkComparisonResult>(
        `/api/network/comparison?${search({ from: p.from, to: p.to, region: p.region })}`,
      ),
  });

export const networkTrendsQuery = (p: PeriodParams, metric: TrendMetric) =>
  queryOptions({
    queryKey: networkKeys.trends(p, metric),
    queryFn: () =>
      fetchJson<TrendsResult>(
        `/api/network/trends?${search({ from: p.from, to: p.to, region: p.region, metric })}`,
      ),
  });

export const shopMetricsQuery = (id: number, p: PeriodParams) =>
  queryOptions({
    queryKey: networkKeys.shopMetrics(id, p),
    queryFn: () =>
      fetchJson<ShopMetricsResult>(
        `/api/shops/${id}/metrics?${search({ from: p.from, to: p.to })}`,
      ),
  });

export const shopTrendsQuery = (id: number, p: PeriodParams, metric: TrendMetric) =>
  queryOptions({
    queryKey: networkKeys.shopTrends(id, p, metric),
    queryFn: () =>
      fetchJson<TrendsResult>(
        `/api/shops/${id}/trends?${search({ from: p.from, to: p.to, metric })}`,
      ),
  });
