import { queryOptions } from '@tanstack/react-query';
import type { ShopSummary } from '~/server/queries/shops';
import { fetchJson } from '../api-client';

export const shopKeys = {
  all: ['shops'] as const,
  one: (id: number) => ['shops', id] as const,
};

export const shopsQuery = () =>
  queryOptions({
    queryKey: shopKeys.all,
    queryFn: () => fetchJson<{ shops: ShopSummary[] }>('/api/shops'),
  });

export const meQuery = () =>
  queryOptions({
    queryKey: ['me'] as const,
    queryFn: () =>
      fetchJson<{ id: number; name: string; email: string; role: string; scope: unknown }>(
        '/api/me',
      ),
  });
