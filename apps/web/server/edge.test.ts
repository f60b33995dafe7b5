import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type * as EnvModule from '~/env';
import * as unknownRoute from '~/app/api/[...path]/route';
import * as importRoute from '~/app/api/imports/jobs/route';
import * as partsRoute from '~/app/api/jobs/[id]/parts/route';
import * as jobRoute from '~/app/api/jobs/[id]/route';
import { proxy } from '~/proxy';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { buildNetwork, type Network } from './bench/fixture';
import { jobMaker } from './bench/test-support';
import { getJobDetail } from './queries/bench';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);
vi.mock('~/env', async (importOriginal) => {
  const actual = await importOriginal<typeof EnvModule>();
  return {
    env: {
      ...actual.env,
      NEXTAUTH_URL: 'http://127.0.0.1:3000',
      APP_BASE_URL: undefined,
      S3_ENDPOINT: 'http://127.0.0.1:9000',
    },
  };
});

const APP = 'http://127.0.0.1:3000';
let net: Network;
const { jobIn } = jobMaker(() => net);

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
  state.principal = net.as.lead;
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

type Handler = (
  request: NextRequest,
  context: { params: Promise<Record<string, string>> },
) => Response | Promise<Response>;

async function send(
  handler: Handler,
  path: string,
  params: Record<string, string>,
  init: { method: string; headers?: Record<string, string>; body?: BodyInit },
) {
  const request = new NextRequest(`${APP}${path}`, { ...init, duplex: 'half' });
  const response = await handler(request, { params: Promise.resolve(params) });
  return {
    status: response.status,
    type: response.headers.get('content-type'),
    body: (await response.json()) as Record<string, unknown>,
  };
}

const json = { 'content-type': 'application/json' };
const part = { name: 'Drag washer', quantity: 1, unitPriceCents: 450 };

describe('cross-site writes', () => {
  it('shop lead – a PATCH from another site is 403 problem+json and saves nothing', async () => {
    const id = String(await jobIn('on_bench'));
    const refused = await send(
      jobRoute.PATCH,
      `/api/jobs/${id}`,
      { id },
      {
        method: 'PATCH',
        headers: { ...json, origin: 'http://evil.example' },
        body: JSON.stringify({ findings: 'Written by another site' }),
      },
    );
    expect(refused).toMatchObject({
      status: 403,
      type: 'application/problem+json',
      body: { type: '/problems/cross-site', title: 'Cross-site request refused' },
    });
    expect((await getJobDetail(net.as.lead, Number(id))).findings).toBeNull();

    const fromApp = await send(
      jobRoute.PATCH,
      `/api/jobs/${id}`,
      { id },
      {
        method: 'PATCH',
        headers: { ...json, origin: APP, 'sec-fetch-site': 'same-origin' },
        body: JSON.stringify({ findings: 'Worn drag washers' }),
      },
    );
    expect(fromApp.status).toBe(200);
    expect((await getJobDetail(net.as.lead, Number(id))).findings).toBe('Worn drag washers');
  });

  it('shop lead – a page on another port of the same host cannot add a part', async () => {
    const id = String(await jobIn('on_bench'));
    const refused = await send(
      partsRoute.POST,
      `/api/jobs/${id}/parts`,
      { id },
      {
        method: 'POST',
        headers: { ...json, origin: 'http://127.0.0.1:9000' },
        body: JSON.stringify(part),
      },
    );
    expect(refused.status).toBe(403);
    expect((await getJobDetail(net.as.lead, Number(id))).parts).toEqual([]);
  });

  it('shop lead – a part sent as text/plain is 415 and not added', async () => {
    const id = String(await jobIn('on_bench'));
    const refused = await send(
      partsRoute.POST,
      `/api/jobs/${id}/parts`,
      { id },
      {
        method: 'POST',
        headers: { 'content-type': 'text/plain;charset=UTF-8' },
        body: JSON.stringify(part),
      },
    );
    expect(refused).toMatchObject({
      status: 415,
      type: 'application/problem+json',
      body: { type: '/problems/unsupported-media-type' },
    });
    expect((await getJobDetail(net.as.lead, Number(id))).parts).toEqual([]);
  });
});

describe('body limits', () => {
  it('shop lead – a 300 kB JSON body is 413 and adds nothing', async () => {
    const id = String(await jobIn('on_bench'));
    const body = JSON.stringify({ ...part, partNumber: 'x'.repeat(300_000) });
    const refused = await send(
      partsRoute.POST,
      `/api/jobs/${id}/parts`,
      { id },
      {
        method: 'POST',
        headers: { ...json, 'content-length': String(body.length) },
        body,
      },
    );
    expect(refused).toMatchObject({
      status: 413,
      type: 'application/problem+json',
      body: { type: '/problems/too-large', detail: 'The body may be at most 256 KiB.' },
    });
    expect((await getJobDetail(net.as.lead, Number(id))).parts).toEqual([]);
  });

  it('shop lead – a chunked body with no length stops being read just past 256 KiB', async () => {
    const id = String(await jobIn('on_bench'));
    let pulled = 0;
    const endless = new ReadableStream<Uint8Array>(
      {
        pull(controller) {
          pulled += 1;
          controller.enqueue(
            new TextEncoder().encode(pulled === 1 ? '{"name":"' : 'x'.repeat(65_536)),
          );
        },
      },
      { highWaterMark: 0 },
    );
    const refused = await send(
      partsRoute.POST,
      `/api/jobs/${id}/parts`,
      { id },
      {
        method: 'POST',
        headers: json,
        body: endless,
      },
    );
    expect(refused.status).toBe(413);
    expect(pulled).toBeLessThan(10);
  });

  it('shop lead – an import past its 51 MiB allowance is 413 while streaming', async () => {
    state.principal = net.as.lead;
    const boundary = 'edge-test-boundary';
    const head = new TextEncoder().encode(
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\nContent-Type: text/csv\r\n\r\n`,
    );
    const row = new TextEncoder().encode(`${'a,'.repeat(32_767)}a\n`);
    let sent = 0;
    const body = new ReadableStream<Uint8Array>(
      {
        pull(controller) {
          sent += 1;
          controller.enqueue(sent === 1 ? head : row);
        },
      },
      { highWaterMark: 0 },
    );
    const refused = await send(
      importRoute.POST as Handler,
      '/api/imports/jobs',
      {},
      {
        method: 'POST',
        headers: { 'content-type': `multipart/form-data; boundary=${boundary}` },
        body,
      },
    );
    expect(refused).toMatchObject({
      status: 413,
      body: { detail: 'The body may be at most 51 MiB.' },
    });
    expect(sent * row.byteLength).toBeLessThan(52 * 1024 * 1024);
  });
});

describe('unknown API paths', () => {
  it('anyone – an unknown /api path is 404 problem+json for every method', async () => {
    state.principal = null;
    for (const method of ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const) {
      const answer = await send(unknownRoute[method], '/api/nope', { unknown: 'nope' }, { method });
      expect(answer, method).toMatchObject({
        status: 404,
        type: 'application/problem+json',
        body: { type: '/problems/not-found', instance: '/api/nope' },
      });
    }
    state.principal = net.as.lead;
  });
});

describe('pages (proxy)', () => {
  const page = (path: string, init: { method?: string; headers?: Record<string, string> } = {}) =>
    proxy(new NextRequest(`${APP}${path}`, init));

  it('visitor – each page gets its own nonce in a CSP that Next reads from the request', () => {
    const first = page('/bench');
    const second = page('/bench');
    const policy = first.headers.get('content-security-policy')!;
    const nonce = first.headers.get('x-middleware-request-x-nonce')!;
    expect(nonce).toMatch(/^[A-Za-z0-9+/]{22}==$/);
    expect(second.headers.get('x-middleware-request-x-nonce')).not.toBe(nonce);
    expect(first.headers.get('x-middleware-request-content-security-policy')).toBe(policy);
    expect(policy).toContain(`script-src 'self' 'nonce-${nonce}' 'strict-dynamic'`);
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).toContain("object-src 'none'");
    // Photos are shown from and uploaded to the storage origin.
    expect(policy).toContain("img-src 'self' data: blob: http://127.0.0.1:9000");
    expect(policy).toContain("connect-src 'self' http://127.0.0.1:9000");
    expect(policy).not.toContain('upgrade-insecure-requests');
    expect(first.headers.get('strict-transport-security')).toBeNull();
  });

  it('attacker – a server action posted from another port is 403 problem+json', async () => {
    const refused = page('/unsubscribe/some-token', {
      method: 'POST',
      headers: { origin: 'http://127.0.0.1:9000', 'next-action': 'abc123' },
    });
    expect(refused.status).toBe(403);
    expect(refused.headers.get('content-type')).toBe('application/problem+json');
    expect(await refused.json()).toMatchObject({ type: '/problems/cross-site' });
    const own = page('/unsubscribe/some-token', {
      method: 'POST',
      headers: { origin: APP, 'next-action': 'abc123' },
    });
    expect(own.headers.get('x-middleware-next')).toBe('1');
  });
});
