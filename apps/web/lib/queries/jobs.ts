import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { CustomerMatch, JobDetail, JobList } from '~/server/queries/bench';
import { fetchJson } from '../api-client';

/** What a server type looks like after JSON: instants become ISO strings. */
export type Json<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Json<U>[]
    : T extends object
      ? { [K in keyof T]: Json<T[K]> }
      : T;

export type JobDetailJson = Json<JobDetail>;
export type JobListJson = Json<JobList>;
export type JobRowJson = JobListJson['jobs'][number];
export type CustomerMatchJson = Json<CustomerMatch>;

/** The list's URL parameters, without empty values, in a stable order (one cache entry per view). */
export function listParams(search: URLSearchParams | Record<string, string | undefined>) {
  const entries =
    search instanceof URLSearchParams ? [...search.entries()] : Object.entries(search);
  return Object.fromEntries(
    entries
      .filter((e): e is [string, string] => typeof e[1] === 'string' && e[1] !== '')
      .sort(([a], [b]) => a.localeCompare(b)),
  );
}

export const jobKeys = {
  all: ['jobs'] as const,
  lists: ['jobs', 'list'] as const,
  list: (params: Record<string, string>) => ['jobs', 'list', params] as const,
  detail: (id: number) => ['jobs', 'detail', id] as const,
  customers: (query: string) => ['customers', query] as const,
};

export const jobsPageQuery = (params: Record<string, string>) =>
  queryOptions({
    queryKey: jobKeys.list(params),
    queryFn: () => fetchJson<JobListJson>(`/api/jobs?${new URLSearchParams(params)}`),
    // Keep the current page on screen while the next one loads.
    placeholderData: keepPreviousData,
  });

export const jobDetailQuery = (id: number) =>
  queryOptions({
    queryKey: jobKeys.detail(id),
    queryFn: () => fetchJson<JobDetailJson>(`/api/jobs/${id}`),
  });

export const customerSearchQuery = (query: string) =>
  queryOptions({
    queryKey: jobKeys.customers(query),
    queryFn: () =>
      fetchJson<{ customers: CustomerMatchJson[] }>(
        `/api/customers?${new URLSearchParams({ query })}`,
      ),
    enabled: query.trim().length >= 2,
    staleTime: 60_000,
  });

/** A value as it travels to the client: the same JSON round trip as an API answer. */
export const asJson = <T>(value: T) => JSON.parse(JSON.stringify(value)) as Json<T>;
