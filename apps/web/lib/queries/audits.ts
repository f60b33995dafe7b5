import { queryOptions } from '@tanstack/react-query';
import type { PlanPreview } from '~/server/audits/plan';
import type { RoundDetail, RoundRow, SampleView } from '~/server/queries/audits';
import type { CorrectiveActionRow } from '~/server/queries/corrective-actions';
import { fetchJson } from '../api-client';
import type { CorrectiveActionListQuery, PlanPreviewQuery } from '../validators/audits';

export const auditKeys = {
  all: ['audits'] as const,
  rounds: () => ['audits', 'rounds'] as const,
  round: (id: number) => ['audits', 'rounds', id] as const,
  sample: (roundId: number, jobId: number) =>
    ['audits', 'rounds', roundId, 'samples', jobId] as const,
  preview: (query: PlanPreviewQuery) => ['audits', 'preview', query] as const,
  allCorrectiveActions: ['corrective-actions'] as const,
  correctiveActions: (query: CorrectiveActionListQuery = {}) =>
    ['corrective-actions', query] as const,
};

const search = (params: Record<string, string | number | undefined>) => {
  const entries = Object.entries(params).filter(([, v]) => v !== undefined && v !== '');
  return entries.length
    ? `?${new URLSearchParams(entries.map(([k, v]) => [k, String(v)])).toString()}`
    : '';
};

export const roundsQuery = () =>
  queryOptions({
    queryKey: auditKeys.rounds(),
    queryFn: () => fetchJson<{ rounds: RoundRow[] }>('/api/audit-rounds'),
  });

export const roundQuery = (id: number) =>
  queryOptions({
    queryKey: auditKeys.round(id),
    queryFn: () => fetchJson<RoundDetail>(`/api/audit-rounds/${id}`),
  });

export const sampleQuery = (roundId: number, jobId: number) =>
  queryOptions({
    queryKey: auditKeys.sample(roundId, jobId),
    queryFn: () => fetchJson<SampleView>(`/api/audit-rounds/${roundId}/samples/${jobId}`),
  });

export const planPreviewQuery = (query: PlanPreviewQuery) =>
  queryOptions({
    queryKey: auditKeys.preview(query),
    queryFn: () =>
      fetchJson<PlanPreview>(
        `/api/audit-rounds/preview${search({
          shopId: query.shopId,
          from: query.from,
          to: query.to,
          aql: query.aql,
          level: query.level,
        })}`,
      ),
    staleTime: 10_000,
  });

export const correctiveActionsQuery = (query: CorrectiveActionListQuery = {}) =>
  queryOptions({
    queryKey: auditKeys.correctiveActions(query),
    queryFn: () =>
      fetchJson<{ correctiveActions: CorrectiveActionRow[] }>(
        `/api/corrective-actions${search({ shopId: query.shopId, status: query.status })}`,
      ),
  });
