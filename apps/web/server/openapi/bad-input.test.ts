import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { importTemplateCsv } from '~/lib/import-template';
import { buildNetwork, type Network } from '~/server/bench/fixture';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { databaseFingerprint, loadRoute, ORIGIN, SAME_ORIGIN_HEADERS } from './test-support';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

// The bad inputs that once reached a 500 or were taken loosely, replayed one by one.

let net: Network;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
}, 120_000);

afterAll(closeMemoryDb);

interface Problem {
  status: number;
  errors?: { field: string; message: string }[];
}

async function call(
  file: string,
  method: 'get' | 'post' | 'put' | 'patch' | 'delete',
  url: string,
  options: { params?: Record<string, string>; body?: unknown; form?: FormData } = {},
) {
  const handler = await loadRoute(file, method);
  const headers: Record<string, string> = { ...SAME_ORIGIN_HEADERS };
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  const request = new NextRequest(new URL(url, ORIGIN), {
    method: method.toUpperCase(),
    headers,
    body: options.form ?? (options.body === undefined ? undefined : JSON.stringify(options.body)),
  });
  const response = await handler(request, { params: Promise.resolve(options.params ?? {}) });
  expect(response.headers.get('content-type')).toContain('application/problem+json');
  return { status: response.status, problem: (await response.json()) as Problem };
}

const fields = (p: Problem) => (p.errors ?? []).map((e) => e.field);

describe('bad input – a 400 naming the field, never a 500', () => {
  it('shop lead – impossible dates in the job list filters are 400 on `to` and on `from`', async () => {
    state.principal = net.as.lead;
    const to = await call('jobs/route.ts', 'get', '/api/jobs?to=2026-02-30');
    expect(to.status).toBe(400);
    expect(fields(to.problem)).toEqual(['query.to']);
    const from = await call('jobs/route.ts', 'get', '/api/jobs?from=2026-02-30');
    expect(from.status).toBe(400);
    expect(fields(from.problem)).toEqual(['query.from']);
  });

  it('shop lead – a NUL in a search is 400, on customers and on the job list', async () => {
    state.principal = net.as.lead;
    const customers = await call('customers/route.ts', 'get', '/api/customers?query=ro%00wan');
    expect(customers.status).toBe(400);
    expect(fields(customers.problem)).toEqual(['query.query']);
    const jobs = await call('jobs/route.ts', 'get', '/api/jobs?q=%00');
    expect(jobs.status).toBe(400);
    expect(fields(jobs.problem)).toEqual(['query.q']);
  });

  it('technician – check-in with 30 February, a lone surrogate or `true` as an id is 400 and stores nothing', async () => {
    state.principal = net.as.tech;
    const before = await databaseFingerprint();
    const body = {
      customer: { id: net.customers.ada.id },
      reel: { id: net.reels.ada.id },
      serviceType: 'tune_up',
      promisedOn: '2027-02-30',
    };
    const date = await call('jobs/route.ts', 'post', '/api/jobs', { body });
    expect(date.status).toBe(400);
    expect(fields(date.problem)).toEqual(['body.promisedOn']);
    const surrogate = await call('jobs/route.ts', 'post', '/api/jobs', {
      body: { ...body, promisedOn: '2027-02-26', complaint: 'Grinds \ud800' },
    });
    expect(surrogate.status).toBe(400);
    expect(fields(surrogate.problem)).toEqual(['body.complaint']);
    const truth = await call('jobs/route.ts', 'post', '/api/jobs', {
      body: { ...body, promisedOn: '2027-02-26', technicianId: true },
    });
    expect(truth.status).toBe(400);
    expect(fields(truth.problem)).toEqual(['body.technicianId']);
    expect(await databaseFingerprint()).toEqual(before);
  });

  it('technician – confirming photo 2147483648 is 400 on `confirm`', async () => {
    state.principal = net.as.tech;
    const { status, problem } = await call(
      'jobs/[id]/photos/route.ts',
      'post',
      '/api/jobs/1/photos',
      {
        params: { id: '1' },
        body: { confirm: 2_147_483_648 },
      },
    );
    expect(status).toBe(400);
    expect(fields(problem)).toEqual(['body.confirm']);
  });

  it('owner – `+2`, `0x10`, `1e3`, ` 2` and 2147483648 are not shop ids: PUT /api/shops/+2/calendar changes nothing', async () => {
    state.principal = net.as.owner;
    const before = await databaseFingerprint();
    const calendar = {
      weekly: { mon: [], tue: [], wed: [], thu: [], fri: [], sat: [], sun: [] },
      closedDates: [],
    };
    for (const id of ['+2', '0x10', '1e3', ' 2', '02', '2147483648']) {
      const { status, problem } = await call(
        'shops/[id]/calendar/route.ts',
        'put',
        `/api/shops/x/calendar`,
        {
          params: { id },
          body: calendar,
        },
      );
      expect(status, id).toBe(400);
      expect(fields(problem), id).toEqual(['path.id']);
    }
    expect(await databaseFingerprint()).toEqual(before);
  });

  it('technician – an unknown field is 400 naming it, and nothing is saved', async () => {
    state.principal = net.as.tech;
    const { status, problem } = await call('jobs/[id]/route.ts', 'patch', '/api/jobs/1', {
      params: { id: '1' },
      body: { findings: 'Fine', shopId: 2, padding: 'x' },
    });
    expect(status).toBe(400);
    expect(problem.errors).toEqual([
      { field: 'body.shopId', message: 'Unknown field' },
      { field: 'body.padding', message: 'Unknown field' },
    ]);
  });

  it('shop lead – a NUL inside a CSV cell is a row error naming the row and column', async () => {
    state.principal = net.as.lead;
    const lines = importTemplateCsv().split(/\r?\n/);
    const csv = `${lines[0]}\n${lines[2]!.replace('Mara Quillon', 'Mara\u0000Quillon')}\n`;
    const headings = lines[0]!.split(',');
    const form = new FormData();
    form.set('file', new File([csv], 'jobs.csv', { type: 'text/csv' }));
    form.set('mapping', JSON.stringify(Object.fromEntries(headings.map((h) => [h, h]))));
    const { status, problem } = await call('imports/jobs/route.ts', 'post', '/api/imports/jobs', {
      form,
    });
    expect(status).toBe(400);
    expect(problem.errors).toEqual([
      expect.objectContaining({
        field: 'row 2, customer_name',
        message: expect.stringContaining('NUL'),
      }),
    ]);
  });

  it('anyone – an unknown /api path is a 404 problem document, for every method', async () => {
    state.principal = null;
    for (const method of ['get', 'post', 'put', 'patch', 'delete'] as const) {
      const { status, problem } = await call('[...path]/route.ts', method, '/api/no-such-thing', {
        params: { path: 'no-such-thing' },
      });
      expect(status, method).toBe(404);
      expect(problem.status).toBe(404);
    }
  });
});
