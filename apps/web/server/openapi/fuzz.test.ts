import { sql } from '@reelwright/db';
import fc from 'fast-check';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { ZodType } from 'zod';
import { env } from '~/env';
import { importTemplateCsv } from '~/lib/import-template';
import { can } from '~/lib/permissions';
import { buildNetwork, type Network } from '~/server/bench/fixture';
import type { Principal } from '~/server/principal';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { jsonSchemaOf, openApiDocument } from './document';
import {
  apply,
  bodyMutation,
  impossibleDate,
  nulText,
  textMutation,
  type Mutation,
} from './fuzz-cases';
import { ROUTES, routeFileOf, type RouteSpec } from './registry';
import { databaseFingerprint, loadRoute, ORIGIN, SAME_ORIGIN_HEADERS } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

// Every route with input gets RUNS generated requests (FUZZ_RUNS; 1,000 when CI=true): its example
// request with one part corrupted. A request its own schemas refuse must be answered 4xx with a
// problem document and change nothing in the database; a read its schemas accept must not be a 5xx.

const RUNS = env.FUZZ_RUNS ?? (env.CI === 'true' ? 1000 : 100);
/** Routes without params, query or body ignore what is sent: fewer cases show that. */
const INPUTLESS_RUNS = Math.min(RUNS, 50);
/** A route's cases on a busy machine: well past a minute. */
const FUZZ_TIMEOUT = 600_000;

let net: Network;
const figures: { route: string; cases: number; refused: number; accepted: number; ms: number }[] =
  [];

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
}, 120_000);

afterAll(async () => {
  await closeMemoryDb();
  const total = figures.reduce((t, f) => t + f.cases, 0);
  const ms = figures.reduce((t, f) => t + f.ms, 0);
  console.log(
    `route fuzz: ${figures.length} routes, ${total} requests (${RUNS} a route with input), ` +
      `${(ms / 1000).toFixed(1)} s, 0 answers of 5xx\n` +
      figures
        .map(
          (f) =>
            `  ${f.route}: ${f.cases} (${f.refused} refused, ${f.accepted} accepted), ${f.ms} ms`,
        )
        .join('\n'),
  );
});

/** Someone who may use the route and belongs to a shop where that matters. */
function callerFor(spec: RouteSpec): Principal | null {
  if (spec.permission === 'public') return null;
  const permission = spec.permission;
  const order = [net.as.lead, net.as.owner, net.as.north, net.as.tech, net.as.auditor];
  const who = order.find((p) => can(p.role, permission));
  if (!who) throw new Error(`No test principal may ${permission}`);
  return who;
}

interface Case {
  params: Record<string, string>;
  query: Record<string, string>;
  /** The JSON text sent, or undefined for no body. */
  body?: string;
}

function requestOf(spec: RouteSpec, c: Case): NextRequest {
  let path = spec.path;
  for (const [k, v] of Object.entries(c.params))
    path = path.replace(`{${k}}`, encodeURIComponent(v));
  const url = new URL(path, ORIGIN);
  for (const [k, v] of Object.entries(c.query)) url.searchParams.set(k, v);
  const headers: Record<string, string> = { ...SAME_ORIGIN_HEADERS };
  if (c.body !== undefined) headers['content-type'] = 'application/json';
  return new NextRequest(url, { method: spec.method.toUpperCase(), headers, body: c.body });
}

/** Whether the route's own schemas take this case, parsed as the route will see it. */
function accepted(spec: RouteSpec, c: Case, request: NextRequest): boolean {
  const ok = (schema: ZodType | undefined, value: unknown) =>
    !schema || schema.safeParse(value).success;
  if (!ok(spec.params, c.params)) return false;
  if (!ok(spec.query, Object.fromEntries(request.nextUrl.searchParams))) return false;
  if (!spec.body) return true;
  if (c.body === undefined) return false;
  try {
    return ok(spec.body, JSON.parse(c.body));
  } catch {
    return false;
  }
}

function caseArbitrary(spec: RouteSpec): fc.Arbitrary<{ c: Case; mutation: Mutation | null }> {
  const example = spec.example ?? {};
  const base: Case = {
    params: example.params ?? {},
    query: example.query ?? {},
    body: spec.body ? JSON.stringify(example.body ?? {}) : undefined,
  };
  const parts: fc.Arbitrary<{ c: Case; mutation: Mutation | null }>[] = [];
  if (spec.params) {
    parts.push(
      textMutation(base.params, jsonSchemaOf(spec.params)).map((mutation) => ({
        c: { ...base, params: asStrings(apply(base.params, mutation), base.params) },
        mutation,
      })),
    );
  }
  if (spec.query) {
    parts.push(
      textMutation(base.query, jsonSchemaOf(spec.query)).map((mutation) => ({
        c: { ...base, query: asStrings(apply(base.query, mutation), {}) },
        mutation,
      })),
    );
  }
  if (spec.body) {
    const schema = jsonSchemaOf(spec.body);
    const arbitrary = bodyMutation(example.body ?? {}, schema).map((mutation) => ({
      c: {
        ...base,
        body:
          mutation.kind === 'not-json'
            ? mutation.text
            : JSON.stringify(apply(example.body ?? {}, mutation) ?? null),
      },
      mutation,
    }));
    // Bodies carry most of the fields: most cases go there.
    parts.push(arbitrary, arbitrary);
  }
  if (parts.length === 0) {
    // No input: junk query strings and bodies, which the route must ignore.
    return fc
      .record({ key: fc.string({ maxLength: 6 }), value: fc.oneof(nulText, impossibleDate) })
      .map(({ key, value }) => ({
        c: { ...base, query: { [key || 'x']: value } },
        mutation: null,
      }));
  }
  return fc.oneof(...parts);
}

/** Path and query values travel as text: anything else is written as JSON would be. */
function asStrings(value: unknown, fallback: Record<string, string>): Record<string, string> {
  if (!value || typeof value !== 'object') return fallback;
  return Object.fromEntries(
    Object.entries(value).map(([k, v]) => [k, typeof v === 'string' ? v : JSON.stringify(v)]),
  );
}

const fuzzed = ROUTES.filter((spec) => !spec.notFuzzed && spec.bodyType !== 'multipart');

describe('route fuzz – bad input is a 4xx problem and writes nothing', () => {
  it('the fuzz tests cover every route in the OpenAPI document but the ones that say why not', () => {
    const documented = Object.entries(openApiDocument().paths).flatMap(([path, ops]) =>
      Object.keys(ops).map((m) => `${m} ${path}`),
    );
    const covered = [
      ...fuzzed,
      ...ROUTES.filter((s) => s.bodyType === 'multipart' || s.notFuzzed),
    ].map((s) => `${s.method} ${s.path}`);
    expect(covered.sort()).toEqual(documented.sort());
  });

  it.each(fuzzed.map((spec) => [`${spec.method.toUpperCase()} ${spec.path}`, spec] as const))(
    '%s',
    async (name, spec) => {
      const handler = await loadRoute(routeFileOf(spec), spec.method);
      state.principal = callerFor(spec);
      const inputless = !spec.params && !spec.query && !spec.body;
      const runs = inputless ? INPUTLESS_RUNS : RUNS;
      const before = await databaseFingerprint();
      const started = performance.now();
      let refused = 0;
      let acceptedCount = 0;
      await fc.assert(
        fc.asyncProperty(caseArbitrary(spec), async ({ c, mutation }) => {
          const request = requestOf(spec, c);
          const ok = accepted(spec, c, request);
          // A NUL or a broken surrogate anywhere, an unknown field: refused by policy, everywhere.
          const mustRefuse =
            mutation !== null &&
            ((mutation.kind === 'replace' && mutation.policy) ||
              mutation.kind === 'unknown-field' ||
              mutation.kind === 'not-json');
          if (mustRefuse) expect(ok, `the schemas take ${JSON.stringify(c)}`).toBe(false);
          // A write the schemas accept would write: only reads run with what they accept, and
          // at most a tenth of the cases, as those reach the database.
          fc.pre(
            !ok || (spec.method === 'get' && (inputless || acceptedCount < Math.max(5, runs / 10))),
          );
          const response = await handler(request, { params: Promise.resolve(c.params) });
          const what = `${name} ${JSON.stringify(c)} → ${response.status}`;
          expect(response.status, what).toBeLessThan(500);
          if (ok) {
            acceptedCount += 1;
            await response.body?.cancel();
            return;
          }
          refused += 1;
          expect(response.status, what).toBeGreaterThanOrEqual(400);
          expect(response.headers.get('content-type'), what).toContain('application/problem+json');
          const problem = (await response.json()) as { status: number };
          expect(problem.status, what).toBe(response.status);
        }),
        { numRuns: runs, maxSkipsPerRun: 1000 },
      );
      figures.push({
        route: name,
        cases: runs,
        refused,
        accepted: acceptedCount,
        ms: Math.round(performance.now() - started),
      });
      expect(await databaseFingerprint()).toEqual(before);
    },
    FUZZ_TIMEOUT,
  );

  it(
    'POST /api/imports/jobs – a CSV or mapping that cannot be imported is a 400 and imports nothing',
    async () => {
      const spec = ROUTES.find((s) => s.bodyType === 'multipart')!;
      const handler = await loadRoute(routeFileOf(spec), spec.method);
      state.principal = net.as.lead;
      const lines = importTemplateCsv().split(/\r?\n/);
      const headers = lines[0]!.split(',');
      // The template's open job: a valid row in any shop (no technician named).
      const good = readCsvRow(lines[2]!);
      const mapping = Object.fromEntries(headers.map((h) => [h, h]));
      const dateColumns = [
        'checked_in_at',
        'promised_at',
        'parts_wait_from',
        'ready_at',
        'collected_at',
      ];
      const column = fc.integer({ min: 0, max: headers.length - 1 });
      const cellCase = fc.oneof(
        fc.record({ col: column, value: nulText }).map(({ col, value }) => ({
          cells: good.map((cell, i) => (i === col ? `${cell}${value}` : cell)),
          mapping,
        })),
        fc
          .record({
            col: fc.constantFrom(...dateColumns),
            value: fc.constantFrom(
              '2025-02-30',
              '2025-02-29',
              '2025-13-01',
              '2025-04-31',
              '2025-00-10',
            ),
          })
          .map(({ col, value }) => ({
            cells: good.map((cell, i) => (headers[i] === col ? `${value} 10:00` : cell)),
            mapping,
          })),
        fc
          .record({
            col: fc.constantFrom('reel_kind', 'service_type', 'state', 'bearing_count', 'water'),
            value: fc.oneof(nulText, fc.constantFrom('??', '-1', '1e3', 'spinning!', '0x10')),
          })
          .map(({ col, value }) => ({
            cells: good.map((cell, i) => (headers[i] === col ? value : cell)),
            mapping,
          })),
        fc
          .record({
            key: fc.constantFrom('nope', 'external_ref'),
            value: fc.oneof(nulText, fc.constantFrom('Missing column')),
          })
          .map(({ key, value }) => ({ cells: good, mapping: { ...mapping, [key]: value } })),
      );
      const before = await databaseFingerprint({ except: ['import_batches'] });
      const started = performance.now();
      const runs = RUNS;
      await fc.assert(
        fc.asyncProperty(cellCase, async ({ cells, mapping: m }) => {
          const csv = `${lines[0]}\n${cells.map(quoteCsv).join(',')}\n`;
          const form = new FormData();
          form.set('file', new File([csv], 'jobs.csv', { type: 'text/csv' }));
          form.set('mapping', JSON.stringify(m));
          const request = new NextRequest(new URL(spec.path, ORIGIN), {
            method: 'POST',
            headers: SAME_ORIGIN_HEADERS,
            body: form,
          });
          const response = await handler(request, { params: Promise.resolve({}) });
          const what = `${JSON.stringify({ cells, m })} → ${response.status}`;
          expect(response.status, what).toBeGreaterThanOrEqual(400);
          expect(response.status, what).toBeLessThan(500);
          expect(response.headers.get('content-type'), what).toContain('application/problem+json');
        }),
        { numRuns: runs },
      );
      figures.push({
        route: 'POST /api/imports/jobs',
        cases: runs,
        refused: runs,
        accepted: 0,
        ms: Math.round(performance.now() - started),
      });
      expect(await databaseFingerprint({ except: ['import_batches'] })).toEqual(before);
      const batches = await state.handle!.db.execute<{ status: string }>(
        sql`select distinct status from import_batches`,
      );
      expect(batches.rows.map((r) => r.status).filter((s) => s !== 'failed')).toEqual([]);
    },
    FUZZ_TIMEOUT,
  );
});

function readCsvRow(line: string): string[] {
  // The template's example rows hold no quoted commas.
  return line.split(',').map((c) => c.replace(/^"|"$/g, ''));
}

const quoteCsv = (cell: string) => (/[",\n\r]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell);
