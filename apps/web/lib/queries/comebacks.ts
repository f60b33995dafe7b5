import { queryOptions } from '@tanstack/react-query';
import type { ComebackSettings, RootCauseRow } from '~/server/comebacks/settings';
import type { ComebackDetail, ComebackList, JobComeback } from '~/server/queries/comebacks';
import { fetchJson } from '../api-client';
import type { ComebackListQuery } from '../validators/comebacks';

export const comebackKeys = {
  all: ['comebacks'] as const,
  lists: ['comebacks', 'list'] as const,
  list: (query: ComebackListQuery) => ['comebacks', 'list', query] as const,
  detail: (id: number) => ['comebacks', 'detail', id] as const,
  job: (jobId: number) => ['comebacks', 'job', jobId] as const,
  settings: ['comebacks', 'settings'] as const,
};

const search = (params: Record<string, string | number | undefined>) => {
  const entries = Object.entries(params).filter(([, v]) => v !== undefined && v !== '');
  return entries.length
    ? `?${new URLSearchParams(entries.map(([k, v]) => [k, String(v)])).toString()}`
    : '';
};

export const comebackListQuery = (query: ComebackListQuery) =>
  queryOptions({
    queryKey: comebackKeys.list(query),
    queryFn: () =>
      fetchJson<ComebackList>(
        `/api/comebacks${search({ shop: query.shop, status: query.status })}`,
      ),
  });

export const comebackDetailQuery = (id: number) =>
  queryOptions({
    queryKey: comebackKeys.detail(id),
    queryFn: () => fetchJson<ComebackDetail>(`/api/comebacks/${id}`),
  });

export const jobComebackQuery = (jobId: number) =>
  queryOptions({
    queryKey: comebackKeys.job(jobId),
    queryFn: () => fetchJson<JobComeback>(`/api/jobs/${jobId}/comeback-of`),
  });

export interface ComebackSettingsView {
  settings: ComebackSettings;
  rootCauses: RootCauseRow[];
}

export const comebackSettingsQuery = () =>
  queryOptions({
    queryKey: comebackKeys.settings,
    queryFn: () => fetchJson<ComebackSettingsView>('/api/settings/comebacks'),
  });
