import { NextRequest } from 'next/server';
import { renderToStaticMarkup } from 'react-dom/server';
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { isNotAllowedStub } from '~/server/method-not-allowed';
import { METHODS, ROUTES, routeFileOf } from './registry';
import { openApiDocument } from './document';
import { API_DIR, loadRoute } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

/**
 * Every route file under app/api with the methods it answers, as "get jobs/[id]/route.ts"; the
 * 405 stubs of `otherMethods` are not answers (method-not-allowed.test.ts checks them).
 */
async function routeFileMethods(): Promise<string[]> {
  const files = readdirSync(API_DIR, { recursive: true, encoding: 'utf8' })
    .filter((f) => path.basename(f) === 'route.ts')
    .map((f) => f.split(path.sep).join('/'));
  const out: string[] = [];
  for (const file of files) {
    const exports = (await import(path.join(API_DIR, file))) as Record<string, unknown>;
    for (const method of METHODS) {
      const handler = exports[method.toUpperCase()];
      if (typeof handler === 'function' && !isNotAllowedStub(handler))
        out.push(`${method} ${file}`);
    }
  }
  return out.sort();
}

describe('OpenAPI document', () => {
  it('describes every route file and method under app/api, and nothing else', async () => {
    const documented = Object.entries(openApiDocument().paths)
      .flatMap(([p, ops]) =>
        Object.keys(ops).map((m) => {
          const spec = ROUTES.find((s) => s.path === p && s.method === m)!;
          return `${m} ${routeFileOf(spec)}`;
        }),
      )
      .sort();
    expect(documented).toEqual(await routeFileMethods());
  });

  it('names each path parameter of a path template, and each example passes its own schemas', () => {
    const doc = openApiDocument();
    for (const spec of ROUTES) {
      const op = doc.paths[spec.path]![spec.method]!;
      const inPath = [...spec.path.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]).sort();
      const declared = (op.parameters ?? [])
        .filter((p) => p.in === 'path')
        .map((p) => p.name)
        .sort();
      if (!spec.catchAll) expect(declared, spec.path).toEqual(inPath);
      const example = spec.example ?? {};
      if (spec.params) expect(spec.params.safeParse(example.params).success, spec.path).toBe(true);
      if (spec.query)
        expect(spec.query.safeParse(example.query ?? {}).success, spec.path).toBe(true);
      if (spec.body && spec.bodyType !== 'multipart')
        expect(spec.body.safeParse(example.body).success, `${spec.method} ${spec.path}`).toBe(true);
    }
  });

  it('anyone – GET /api/openapi.json answers the OpenAPI 3.1 document without signing in', async () => {
    const GET = await loadRoute('openapi.json/route.ts', 'get');
    const response = await GET(new NextRequest('http://127.0.0.1:3000/api/openapi.json'), {
      params: Promise.resolve({}),
    });
    expect(response.status).toBe(200);
    const doc = (await response.json()) as ReturnType<typeof openApiDocument>;
    expect(doc.openapi).toBe('3.1.0');
    expect(
      doc.paths['/api/jobs/{id}']?.patch?.requestBody?.content['application/json']?.schema,
    ).toMatchObject({
      type: 'object',
      additionalProperties: false,
      properties: {
        promisedOn: { type: 'string' },
        technicianId: { anyOf: [{ type: 'integer', minimum: 1 }, { type: 'null' }] },
      },
    });
    expect(doc.paths['/api/jobs/{id}']?.get?.parameters).toEqual([
      expect.objectContaining({
        name: 'id',
        in: 'path',
        required: true,
        schema: expect.objectContaining({ pattern: '^[1-9][0-9]{0,9}$' }),
      }),
    ]);
  });

  it('signed-in user – the API reference page lists every route with its parameters and body, with no script', async () => {
    const { default: ApiReferencePage } = await import('~/app/(app)/api-reference/page');
    const html = renderToStaticMarkup(await ApiReferencePage());
    for (const spec of ROUTES) expect(html, spec.path).toContain(spec.path.replace(/'/g, '&#x27;'));
    expect(html).toContain('promisedOn');
    expect(html).toContain('pattern ^[1-9][0-9]{0,9}$');
    expect(html).not.toContain('<script');
  });
});
