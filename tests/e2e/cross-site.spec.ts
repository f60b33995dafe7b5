import { expect, test, type APIRequestContext, type APIResponse } from '@playwright/test';
import { readFile } from 'node:fs/promises';
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { baseURL } from '../playwright.config';
import { storageState, type AccountName } from './accounts';
import { monthsBefore } from './clock';

// A month over in every demo shop; month-close.spec.ts closes the one after it (last month).
const MONTH = monthsBefore(2);

interface JobJson {
  id: number;
  findings: string | null;
  parts: unknown[];
}

async function marramOpenJob(request: APIRequestContext): Promise<JobJson> {
  const list = await request.get('/api/jobs?state=on_bench&pageSize=25');
  expect(list.status()).toBe(200);
  const { jobs } = (await list.json()) as { jobs: { id: number }[] };
  expect(jobs.length).toBeGreaterThan(0);
  return readJob(request, jobs[0]!.id);
}

async function readJob(request: APIRequestContext, id: number): Promise<JobJson> {
  const response = await request.get(`/api/jobs/${id}`);
  expect(response.status()).toBe(200);
  return (await response.json()) as JobJson;
}

async function expectProblem(response: APIResponse, status: number, type: string) {
  expect(response.status()).toBe(status);
  expect(response.headers()['content-type']).toBe('application/problem+json');
  expect(await response.json()).toMatchObject({ status, type });
}

/** The session cookie of a saved sign-in, as a Cookie header for requests made outside Playwright. */
async function cookieHeader(name: AccountName) {
  const state = JSON.parse(await readFile(storageState(name), 'utf8')) as {
    cookies: { name: string; value: string }[];
  };
  return state.cookies.map((c) => `${c.name}=${c.value}`).join('; ');
}

/** A POST with a chunked body and no Content-Length, which Playwright's request API cannot send. */
function postChunked(path: string, cookie: string, chunks: number) {
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = httpRequest(`${baseURL}${path}`, {
      method: 'POST',
      headers: { cookie, 'content-type': 'application/json', 'transfer-encoding': 'chunked' },
    });
    req.on('response', (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (body += chunk));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    // The server may answer and close before every chunk is out: that is the point.
    req.on('error', (error: NodeJS.ErrnoException) =>
      error.code === 'EPIPE' || error.code === 'ECONNRESET' ? undefined : reject(error),
    );
    req.write('{"name":"');
    let sent = 0;
    const next = () => {
      while (sent < chunks) {
        sent += 1;
        if (!req.write('x'.repeat(64 * 1024))) return void req.once('drain', next);
      }
      req.end('"}');
    };
    next();
  });
}

test.describe('shop lead, replaying the cross-site and oversized requests', () => {
  test.use({ storageState: storageState('leadMarram') });

  test('shop lead – a PATCH with Origin http://evil.example and the lead’s cookie is 403 and saves nothing', async ({
    request,
  }) => {
    const job = await marramOpenJob(request);
    const refused = await request.patch(`/api/jobs/${job.id}`, {
      headers: { origin: 'http://evil.example' },
      data: { findings: 'Written from another site' },
    });
    await expectProblem(refused, 403, '/problems/cross-site');
    expect((await readJob(request, job.id)).findings).toBe(job.findings);
  });

  test('shop lead – a part sent as text/plain is refused and not added', async ({ request }) => {
    const job = await marramOpenJob(request);
    const body = JSON.stringify({ name: 'Drag washer', quantity: 1, unitPriceCents: 450 });
    // What a cross-site page can send without a preflight…
    const crossSite = await request.post(`/api/jobs/${job.id}/parts`, {
      headers: { 'content-type': 'text/plain;charset=UTF-8', origin: 'http://evil.example' },
      data: body,
    });
    await expectProblem(crossSite, 403, '/problems/cross-site');
    // …and the same body from a client that names no origin.
    const plain = await request.post(`/api/jobs/${job.id}/parts`, {
      headers: { 'content-type': 'text/plain;charset=UTF-8' },
      data: body,
    });
    await expectProblem(plain, 415, '/problems/unsupported-media-type');
    expect((await readJob(request, job.id)).parts).toHaveLength(job.parts.length);
  });

  test('shop lead – a 300 kB JSON body is 413, with or without Content-Length', async ({
    request,
  }) => {
    const job = await marramOpenJob(request);
    const big = await request.post(`/api/jobs/${job.id}/parts`, {
      data: { name: 'Drag washer', quantity: 1, unitPriceCents: 450, note: 'x'.repeat(300_000) },
    });
    await expectProblem(big, 413, '/problems/too-large');
    // 16 MiB in chunks with no length: refused once 256 KiB have arrived.
    const chunked = await postChunked(
      `/api/jobs/${job.id}/parts`,
      await cookieHeader('leadMarram'),
      256,
    );
    expect(chunked.status).toBe(413);
    expect(JSON.parse(chunked.body)).toMatchObject({ type: '/problems/too-large' });
    expect((await readJob(request, job.id)).parts).toHaveLength(job.parts.length);
  });

  test('anyone – an unknown /api path is 404 problem+json, not the HTML page', async ({
    request,
  }) => {
    await expectProblem(await request.get('/api/nope'), 404, '/problems/not-found');
    await expectProblem(await request.post('/api/nope', { data: {} }), 404, '/problems/not-found');
    await expectProblem(await request.get('/api/jobs/1/nope'), 404, '/problems/not-found');
  });

  test('anyone – pages and API answers carry the security headers', async ({ request }) => {
    const page = await request.get('/bench');
    expect(page.status()).toBe(200);
    const headers = page.headers();
    const policy = headers['content-security-policy']!;
    const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
    expect(nonce).toBeTruthy();
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).toMatch(/img-src 'self' data: blob: http:\/\/127\.0\.0\.1:\d+/);
    // Next puts this response's nonce on its scripts, and no script goes without it.
    const html = await page.text();
    const scripts = html.match(/<script\b[^>]*>/g) ?? [];
    expect(scripts.length).toBeGreaterThan(1);
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
    expect((await request.get('/bench')).headers()['content-security-policy']).not.toContain(
      nonce!,
    );

    const api = (await request.get('/api/me')).headers();
    for (const h of [headers, api]) {
      expect(h['x-content-type-options']).toBe('nosniff');
      expect(h['referrer-policy']).toBe('strict-origin-when-cross-origin');
      expect(h['permissions-policy']).toContain('camera=(), microphone=(), geolocation=()');
      // Served over plain http here: no HSTS.
      expect(h['strict-transport-security']).toBeUndefined();
    }
    expect(api['content-security-policy']).toBe(
      "default-src 'none'; frame-ancestors 'none'; sandbox",
    );
  });
});

test.describe('owner in Chromium, on a page served from another port of the same host', () => {
  test.use({ storageState: storageState('owner') });
  let attacker: Server;
  let probe: Server;
  let attackerOrigin: string;
  // What a third port on the same host received from the attacker's page: the same cookies the app got.
  const probed: { cookie?: string; origin?: string } = {};

  const listen = async (server: Server) => {
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    return `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  };

  test.beforeAll(async () => {
    probe = createServer((req, res) => {
      probed.cookie = req.headers.cookie;
      probed.origin = req.headers.origin;
      res.end();
    });
    const probeOrigin = await listen(probe);
    const targets = [`${baseURL}/api/month-close/${MONTH}/close`, `${probeOrigin}/probe`];
    attacker = createServer((_req, res) => {
      res.setHeader('content-type', 'text/html; charset=utf-8');
      res.end(`<!doctype html><title>Free reel parts</title>
<script>
  const send = (url) => fetch(url, { method: 'POST', mode: 'no-cors', credentials: 'include' });
  Promise.allSettled(${JSON.stringify(targets)}.map(send)).then(() => { document.title = 'sent'; });
</script>`);
    });
    attackerOrigin = await listen(attacker);
  });

  test.afterAll(async () => {
    await new Promise((resolve) => attacker.close(resolve));
    await new Promise((resolve) => probe.close(resolve));
  });

  test('owner – a no-cors POST from another port does not close the month', async ({
    page,
    request,
  }) => {
    const status = async () =>
      ((await (await request.get(`/api/month-close/${MONTH}`)).json()) as { status: string })
        .status;
    if ((await status()) === 'closed') {
      const reopened = await request.post(`/api/month-close/${MONTH}/reopen`, {
        data: { reason: 'Reopened by the cross-site test so that an attack could close it.' },
      });
      expect(reopened.status()).toBe(200);
    }
    expect(await status()).toBe('open');

    const answered = page.waitForResponse((r) => r.url().endsWith(`/month-close/${MONTH}/close`));
    await page.goto(attackerOrigin);
    const response = await answered;
    await expect(page).toHaveTitle('sent');
    // Chromium sends the owner's session along (a site is not a port): only the origin rule stands in the way.
    expect(probed.cookie).toContain('session-token=');
    expect(probed.origin).toBe(attackerOrigin);
    expect(response.status()).toBe(403);
    expect(await status()).toBe('open');
  });

  test('owner – the network page hydrates its charts under the CSP with no violation', async ({
    page,
  }) => {
    await page.addInitScript(() => {
      const seen: string[] = [];
      (window as unknown as { cspViolations: string[] }).cspViolations = seen;
      document.addEventListener('securitypolicyviolation', (e) =>
        seen.push(`${e.violatedDirective} ${e.blockedURI} ${e.sourceFile}:${e.lineNumber}`),
      );
    });
    await page.goto('/network');
    // The funnel's drawing loads (a chunk of its own) once it scrolls near.
    await page
      .getByRole('figure', { name: /^Comebacks observed ÷ expected against comebacks expected/ })
      .scrollIntoViewIfNeeded();
    await expect(page.locator('svg.recharts-surface').first()).toBeVisible();
    // A client-side navigation works only once React has hydrated.
    await page.getByRole('link', { name: 'Month close' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Month close' })).toBeVisible();
    expect(
      await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations),
    ).toEqual([]);
  });
});
