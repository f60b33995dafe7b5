import type { Db } from '@reelwright/db';
import { NextRequest } from 'next/server';
import { testState as state } from '~/server/testing/memory-db';
import type { RouteSpec } from '../registry';
import { ORIGIN, SAME_ORIGIN_HEADERS, type Handler } from '../test-support';
import type { Input } from './plan';

// Sending one matrix case to a route handler in-process, as a browser on the app's own page would.

export interface Answer {
  status: number;
  contentType: string;
  /** The problem document's `type`, for answers of 400 and above. */
  problemType?: string;
  /** The problem's detail and field errors, to say why when a case fails. */
  detail?: string;
}

export function requestOf(spec: RouteSpec, input: Input): NextRequest {
  let path = spec.path;
  for (const [k, v] of Object.entries(input.params))
    path = path.replace(`{${k}}`, encodeURIComponent(v));
  const url = new URL(path, ORIGIN);
  for (const [k, v] of Object.entries(input.query)) url.searchParams.set(k, v);
  const headers: Record<string, string> = { ...SAME_ORIGIN_HEADERS };
  const method = spec.method.toUpperCase();
  if (input.form) return new NextRequest(url, { method, headers, body: input.form });
  const body = input.body === undefined ? undefined : JSON.stringify(input.body);
  if (body !== undefined) headers['content-type'] = 'application/json';
  return new NextRequest(url, { method, headers, body });
}

export async function send(
  handler: Handler,
  request: NextRequest,
  params: Record<string, string>,
): Promise<Answer> {
  const response = await handler(request, { params: Promise.resolve(params) });
  const contentType = response.headers.get('content-type') ?? '';
  if (response.status < 400) {
    await response.body?.cancel();
    return { status: response.status, contentType };
  }
  const text = await response.text();
  try {
    const problem = JSON.parse(text) as { type?: string; detail?: string; errors?: unknown };
    const detail = [problem.detail, problem.errors && JSON.stringify(problem.errors)];
    return {
      status: response.status,
      contentType,
      problemType: problem.type,
      detail: detail.filter(Boolean).join(' '),
    };
  } catch {
    return { status: response.status, contentType, detail: text.slice(0, 200) };
  }
}

const ROLLBACK = Symbol('rollback');

/**
 * Runs `work` with the route's database calls inside one transaction that is rolled back, so a
 * write that succeeds leaves the next case the same seeded data. Route code's own transactions
 * become savepoints inside it.
 */
export async function rolledBack<T>(work: () => Promise<T>): Promise<T> {
  const base = state.handle!;
  let result: T | undefined;
  try {
    await base.db.transaction(async (tx) => {
      state.handle = { ...base, db: tx as unknown as Db };
      result = await work();
      throw ROLLBACK;
    });
  } catch (error) {
    if (error !== ROLLBACK) throw error;
  } finally {
    state.handle = base;
  }
  return result as T;
}
