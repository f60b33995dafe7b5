import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as monthRoute from '~/app/api/month-close/[month]/route';
import * as closeRoute from '~/app/api/month-close/[month]/close/route';
import * as invoicesRoute from '~/app/api/month-close/[month]/invoices/route';
import * as reopenRoute from '~/app/api/month-close/[month]/reopen/route';
import * as batchRoute from '~/app/api/reminders/batches/[id]/route';
import * as batchesRoute from '~/app/api/reminders/batches/route';
import * as dueRoute from '~/app/api/reminders/due/route';
import * as sendRoute from '~/app/api/reminders/send/route';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildMonthCloseNetwork } from './test-network';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildMonthCloseNetwork(state.handle!.db);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

type Handler = (
  request: NextRequest,
  context: { params: Promise<Record<string, string>> },
) => Promise<Response>;

const json = { 'content-type': 'application/json' };
const CALLS: {
  name: string;
  handler: Handler;
  url: string;
  params?: Record<string, string>;
  init?: RequestInit;
}[] = [
  {
    name: 'GET month close',
    handler: monthRoute.GET,
    url: '/api/month-close/2026-11',
    params: { month: '2026-11' },
  },
  {
    name: 'GET month close CSV',
    handler: monthRoute.GET,
    url: '/api/month-close/2026-11.csv',
    params: { month: '2026-11.csv' },
  },
  {
    name: 'POST close',
    handler: closeRoute.POST,
    url: '/api/month-close/2026-11/close',
    params: { month: '2026-11' },
    init: { method: 'POST' },
  },
  {
    name: 'POST reopen',
    handler: reopenRoute.POST,
    url: '/api/month-close/2026-11/reopen',
    params: { month: '2026-11' },
    init: {
      method: 'POST',
      headers: json,
      body: JSON.stringify({ reason: 'A job was priced wrongly.' }),
    },
  },
  {
    name: 'POST invoices',
    handler: invoicesRoute.POST,
    url: '/api/month-close/2026-11/invoices',
    params: { month: '2026-11' },
    init: { method: 'POST' },
  },
  { name: 'GET due reminders', handler: dueRoute.GET, url: '/api/reminders/due?weeks=4' },
  {
    name: 'POST send reminders',
    handler: sendRoute.POST,
    url: '/api/reminders/send',
    init: { method: 'POST', headers: json, body: JSON.stringify({ weeks: 4 }) },
  },
  { name: 'GET batches', handler: batchesRoute.GET, url: '/api/reminders/batches' },
  {
    name: 'GET one batch',
    handler: batchRoute.GET,
    url: '/api/reminders/batches/1',
    params: { id: '1' },
  },
];

function call(c: (typeof CALLS)[number]) {
  return c.handler(
    new NextRequest(
      `http://127.0.0.1${c.url}`,
      c.init as ConstructorParameters<typeof NextRequest>[1],
    ),
    {
      params: Promise.resolve(c.params ?? {}),
    },
  );
}

describe('month close and reminders – who may', () => {
  it('technician – gets 403 for every month-close and reminder route', async () => {
    state.principal = net.techDune;
    for (const c of CALLS) {
      const response = await call(c);
      expect(response.status, c.name).toBe(403);
      expect(response.headers.get('content-type'), c.name).toContain('application/problem+json');
    }
  });

  it('auditor – gets 403 for every month-close and reminder route', async () => {
    state.principal = net.auditor;
    for (const c of CALLS) expect((await call(c)).status, c.name).toBe(403);
  });

  it('shop lead – gets 403 for month close; owner and managers get 403 for reminders', async () => {
    state.principal = net.leadDune;
    for (const c of CALLS.filter((c) => c.url.startsWith('/api/month-close'))) {
      expect((await call(c)).status, c.name).toBe(403);
    }
    for (const who of [net.owner, net.north]) {
      state.principal = who;
      for (const c of CALLS.filter((c) => c.url.startsWith('/api/reminders'))) {
        expect((await call(c)).status, `${who.role} ${c.name}`).toBe(403);
      }
    }
  });

  it('regional manager – may download the CSV of the region, but not close or invoice', async () => {
    state.principal = net.north;
    const csv = await call(CALLS[1]!);
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-type')).toBe('text/csv; charset=utf-8; header=present');
    expect(csv.headers.get('content-disposition')).toContain(
      'reelwright-month-close-2026-11-test-north.csv',
    );
    const text = await csv.text();
    expect(text).toContain('Dune Test Shop');
    expect(text).not.toContain('Reef Test Shop');
    for (const name of ['POST close', 'POST reopen', 'POST invoices']) {
      expect((await call(CALLS.find((c) => c.name === name)!)).status, name).toBe(403);
    }
  });

  it('signed out – gets 401; a malformed month is a 400 with the field named', async () => {
    state.principal = null;
    expect((await call(CALLS[0]!)).status).toBe(401);
    state.principal = net.owner;
    const bad = await call({ ...CALLS[0]!, params: { month: '2026-13' } });
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({
      errors: [expect.objectContaining({ field: expect.stringContaining('month') })],
    });
  });
});
