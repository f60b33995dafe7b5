import { queryOptions } from '@tanstack/react-query';
import type { MonthCloseReport } from '~/server/queries/month-close';
import type { RoyaltyRequest } from '~/server/queue/royalties';
import { fetchJson } from '../api-client';

/** A server type as it arrives over JSON: instants become ISO strings. */
export type Json<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Json<U>[]
    : T extends readonly (infer U)[]
      ? readonly Json<U>[]
      : T extends object
        ? { [K in keyof T]: Json<T[K]> }
        : T;

export type MonthCloseData = Json<MonthCloseReport>;
export type IssueData = Json<RoyaltyRequest>;

export const monthCloseKeys = {
  all: ['month-close'] as const,
  month: (month: string) => ['month-close', month] as const,
};

export const monthCloseQuery = (month: string) =>
  queryOptions({
    queryKey: monthCloseKeys.month(month),
    queryFn: () => fetchJson<MonthCloseData>(`/api/month-close/${month}`),
    // While the queue issues the month's invoices, follow them arriving.
    refetchInterval: (query) => {
      const invoicing = query.state.data?.invoicing;
      return invoicing && !invoicing.doneAt ? 1500 : false;
    },
  });

const post = <T>(url: string, body?: unknown) =>
  fetchJson<T>(url, {
    method: 'POST',
    headers: body === undefined ? undefined : { 'content-type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });

export const closeMonthRequest = (month: string) =>
  post<MonthCloseData>(`/api/month-close/${month}/close`);
export const reopenMonthRequest = (month: string, reason: string) =>
  post<MonthCloseData>(`/api/month-close/${month}/reopen`, { reason });
export const issueInvoicesRequest = (month: string) =>
  post<IssueData>(`/api/month-close/${month}/invoices`);
export const monthCsvHref = (month: string) => `/api/month-close/${month}.csv`;
