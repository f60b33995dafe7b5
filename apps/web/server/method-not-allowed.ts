import type { NextRequest } from 'next/server';
import { ApiError, problemResponse } from './errors';

// Next answers a method a route file does not export with an empty 405 of its own. Each route
// file instead exports the methods it does not answer from `otherMethods`, so every /api answer
// is a problem document, with an Allow header naming what the route does answer.

export const HTTP_METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;
export type HttpMethod = (typeof HTTP_METHODS)[number];

type Stub = ((request: NextRequest) => Response) & { readonly [NOT_ALLOWED]: true };

const NOT_ALLOWED = Symbol('method-not-allowed');

/** True for a handler made by `otherMethods`: the route does not answer that method. */
export function isNotAllowedStub(handler: unknown): boolean {
  return typeof handler === 'function' && NOT_ALLOWED in handler;
}

/** The Allow header of a route answering `allowed` (HEAD and OPTIONS come with Next). */
export function allowHeader(allowed: readonly HttpMethod[]): string {
  const methods = new Set<string>(allowed);
  if (methods.has('GET')) methods.add('HEAD');
  methods.add('OPTIONS');
  return [...methods].sort().join(', ');
}

function stub(handler: (request: NextRequest) => Response): Stub {
  return Object.assign(handler, { [NOT_ALLOWED]: true as const });
}

/**
 * Handlers for every method but `allowed`: 405 problem documents with Allow; and OPTIONS, which
 * Next would otherwise answer listing these stubs as allowed.
 *
 *   export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
 */
export function otherMethods<const A extends readonly HttpMethod[]>(allowed: A) {
  const allow = allowHeader(allowed);
  const handlers: Record<string, Stub> = {};
  for (const method of HTTP_METHODS) {
    if (allowed.includes(method)) continue;
    handlers[method] = stub((request) => {
      const response = problemResponse(
        new ApiError(
          405,
          'method-not-allowed',
          'Method not allowed',
          `${request.method} is not answered here; this resource answers ${allow}.`,
        ),
        request.nextUrl.pathname,
      );
      response.headers.set('allow', allow);
      return response;
    });
  }
  const options = stub(() => new Response(null, { status: 204, headers: { allow } }));
  return { ...handlers, OPTIONS: options } as Record<Exclude<HttpMethod, A[number]>, Stub> & {
    OPTIONS: Stub;
  };
}
