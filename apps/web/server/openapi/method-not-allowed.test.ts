import { NextRequest } from 'next/server';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { allowHeader, HTTP_METHODS, type HttpMethod } from '~/server/method-not-allowed';
import { ROUTES, routeFileOf } from './registry';
import { API_DIR, ORIGIN, SAME_ORIGIN_HEADERS } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

// Every route of the registry, asked with each method it does not answer (DELETE /api/me,
// PUT /api/health, …): 405 as a problem document with an Allow header naming the methods the
// registry gives the route, never Next's empty 405. The catch-all answers 404 to every method.

const byFile = new Map<string, { path: string; methods: HttpMethod[] }>();
for (const spec of ROUTES) {
  if (spec.path === '/api/{path}') continue;
  const file = routeFileOf(spec);
  const entry = byFile.get(file) ?? { path: spec.path, methods: [] };
  entry.methods.push(spec.method.toUpperCase() as HttpMethod);
  byFile.set(file, entry);
}

const cases = [...byFile].flatMap(([file, { path: p, methods }]) =>
  HTTP_METHODS.filter((m) => !methods.includes(m)).map((method) => ({
    file,
    path: p,
    method,
    methods,
  })),
);

/** The path with every parameter filled, as a client would send it. */
const concrete = (p: string) => p.replace(/\{[^}]+\}/g, '1');

describe('methods a route does not answer', () => {
  it.each(cases.map((c) => [`${c.method} ${c.path}`, c] as const))(
    'anyone – %s is 405 problem+json with Allow',
    async (_name, c) => {
      const exports = (await import(path.join(API_DIR, c.file))) as Record<string, unknown>;
      const handler = exports[c.method] as
        ((r: NextRequest) => Promise<Response> | Response) | undefined;
      expect(handler, `${c.file} exports no ${c.method} stub`).toBeTypeOf('function');
      const body = c.method === 'GET' ? undefined : '{}';
      const request = new NextRequest(new URL(concrete(c.path), ORIGIN), {
        method: c.method,
        headers: { ...SAME_ORIGIN_HEADERS, 'content-type': 'application/json' },
        body,
      });
      const response = await handler!(request);
      expect(response.status).toBe(405);
      expect(response.headers.get('content-type')).toContain('application/problem+json');
      expect(response.headers.get('allow')).toBe(allowHeader(c.methods));
      expect(await response.json()).toMatchObject({
        status: 405,
        type: '/problems/method-not-allowed',
        instance: concrete(c.path),
      });
    },
  );

  it.each([...byFile].map(([file, v]) => [v.path, file, v.methods] as const))(
    'anyone – OPTIONS %s lists what the route answers',
    async (_path, file, methods) => {
      const exports = (await import(path.join(API_DIR, file))) as Record<string, unknown>;
      const options = exports.OPTIONS as (r: NextRequest) => Response;
      const response = options(new NextRequest(new URL('/api/x', ORIGIN), { method: 'OPTIONS' }));
      expect(response.status).toBe(204);
      expect(response.headers.get('allow')).toBe(allowHeader(methods));
    },
  );

  it('covers the methods of DELETE /api/me and PUT /api/health', () => {
    const names = cases.map((c) => `${c.method} ${c.path}`);
    expect(names).toEqual(expect.arrayContaining(['DELETE /api/me', 'PUT /api/health']));
  });
});
