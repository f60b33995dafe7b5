import { queryOptions } from '@tanstack/react-query';
import type { DueReport } from '~/server/reminders/due';
import type { BatchView } from '~/server/reminders/send';
import { fetchJson } from '../api-client';
import type { Json } from './month-close';

export type DueData = Json<DueReport>;
export type BatchData = Json<BatchView>;

export const reminderKeys = {
  all: ['reminders'] as const,
  due: (shopId: number, weeks: number) => ['reminders', 'due', shopId, weeks] as const,
  batches: (shopId: number) => ['reminders', 'batches', shopId] as const,
  batch: (id: number) => ['reminders', 'batch', id] as const,
};

export const dueRemindersQuery = (shopId: number, weeks: number) =>
  queryOptions({
    queryKey: reminderKeys.due(shopId, weeks),
    queryFn: () => fetchJson<DueData>(`/api/reminders/due?shop=${shopId}&weeks=${weeks}`),
  });

export const reminderBatchesQuery = (shopId: number) =>
  queryOptions({
    queryKey: reminderKeys.batches(shopId),
    queryFn: () => fetchJson<{ batches: BatchData[] }>(`/api/reminders/batches?shop=${shopId}`),
  });

/** A batch while it runs: polled twice a second until it is done or failed. */
export const reminderBatchQuery = (id: number) =>
  queryOptions({
    queryKey: reminderKeys.batch(id),
    queryFn: () => fetchJson<BatchData>(`/api/reminders/batches/${id}`),
    refetchInterval: (query) => (query.state.data?.status === 'running' ? 500 : false),
  });

export const sendRemindersRequest = (shopId: number, weeks: number) =>
  fetchJson<{ batch: BatchData; alreadyRunning: boolean }>('/api/reminders/send', {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ shopId, weeks }),
  });
