// `pnpm perf:pages`: how heavy and how fast each main page is, per role, in Chromium.
// Starts the end-to-end server (tests/e2e/serve.sh: a fresh seeded database and `next start`, so
// build the web app first) on a free port, or measures --url=… when given one. Signs each role in
// through the sign-in page and loads each of its main pages in a fresh tab, then prints per page:
// the JavaScript sent (gzip as transferred, and raw), time to first byte, first contentful paint,
// and the time until the page's figures are visible. Figures are printed, never asserted; the
// budgets beside them are the project's (README "Page weight and speed").
import { chromium, type Page, type Response } from '@playwright/test';
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { loadavg } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { ACCOUNTS, DEMO_PASSWORD, type AccountName } from '../e2e/accounts';

const { values: args } = parseArgs({
  options: {
    url: { type: 'string', default: '' },
    runs: { type: 'string', default: '3' },
  },
});
const RUNS = Math.max(1, Number(args.runs));

/** gzip kB of JavaScript a page may send: the network page carries its charts. */
const BUDGET_KB = { default: 200, '/network': 250 } as const;

interface PageSpec {
  path: string | ((ids: Ids) => string);
  /** What must be on screen for the page's figures to count as visible. */
  ready: (page: Page) => ReturnType<Page['locator']>;
}
interface Ids {
  shopId: number;
  jobId: number;
}

const table = (page: Page) => page.locator('main table tbody tr').first();
const heading = (page: Page) => page.locator('main h1').first();

const PAGES: Partial<Record<AccountName, PageSpec[]>> = {
  owner: [
    { path: '/', ready: table },
    { path: '/network', ready: table },
    { path: '/month-close', ready: table },
    { path: '/audits', ready: heading },
    { path: '/settings', ready: heading },
  ],
  managerNorth: [
    { path: '/', ready: table },
    { path: '/network', ready: table },
    { path: '/comebacks', ready: heading },
    { path: '/corrective-actions', ready: heading },
  ],
  leadMarram: [
    { path: '/', ready: table },
    { path: '/bench', ready: table },
    { path: ({ shopId }) => `/shops/${shopId}`, ready: heading },
    { path: '/comebacks', ready: heading },
    { path: '/reminders', ready: heading },
  ],
  techMarram: [
    { path: '/', ready: heading },
    { path: '/bench', ready: table },
    { path: '/bench/new', ready: heading },
    { path: ({ jobId }) => `/bench/jobs/${jobId}`, ready: heading },
  ],
  auditor: [
    { path: '/', ready: heading },
    { path: '/audits', ready: heading },
  ],
};

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
    });
  });
}

async function startServer(): Promise<{ base: string; child: ChildProcess }> {
  const port = await freePort();
  const root = path.resolve(import.meta.dirname, '../..');
  const child = spawn('bash', ['tests/e2e/serve.sh'], {
    cwd: root,
    env: { ...process.env, E2E_PORT: String(port) },
    stdio: ['ignore', 'ignore', 'inherit'],
    detached: true,
  });
  const base = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 180_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error('the end-to-end server stopped while starting');
    try {
      if ((await fetch(`${base}/api/health`)).ok) return { base, child };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  throw new Error('the end-to-end server did not answer /api/health within 3 minutes');
}

interface Figures {
  gzipKb: number;
  rawKb: number;
  ttfbMs: number;
  fcpMs: number;
  visibleMs: number;
}

async function measure(page: Page, url: string, spec: PageSpec): Promise<Figures> {
  const scripts: Promise<{ gzip: number; raw: number }>[] = [];
  const onResponse = (response: Response) => {
    if (response.request().resourceType() !== 'script') return;
    scripts.push(
      Promise.all([response.request().sizes(), response.body().catch(() => Buffer.alloc(0))]).then(
        ([sizes, body]) => ({ gzip: sizes.responseBodySize, raw: body.length }),
      ),
    );
  };
  page.on('response', onResponse);
  await page.goto(url, { waitUntil: 'commit' });
  await spec.ready(page).waitFor({ state: 'visible', timeout: 60_000 });
  const visibleMs = await page.evaluate(() => performance.now());
  await page.waitForLoadState('networkidle');
  const timing = await page.evaluate(() => {
    const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
    const fcp = performance.getEntriesByName('first-contentful-paint')[0];
    return { ttfb: nav.responseStart, fcp: fcp?.startTime ?? NaN };
  });
  page.off('response', onResponse);
  const sizes = await Promise.all(scripts);
  const sum = (k: 'gzip' | 'raw') => sizes.reduce((s, x) => s + x[k], 0) / 1024;
  return {
    gzipKb: sum('gzip'),
    rawKb: sum('raw'),
    ttfbMs: timing.ttfb,
    fcpMs: timing.fcp,
    visibleMs,
  };
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor((s.length - 1) / 2)]!;
};

async function main() {
  const started = args.url ? null : await startServer();
  const base = args.url || started!.base;
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
  });
  const rows: string[] = [];
  try {
    for (const [name, specs] of Object.entries(PAGES) as [AccountName, PageSpec[]][]) {
      const signInContext = await browser.newContext();
      const signIn = await signInContext.newPage();
      await signIn.goto(`${base}/sign-in`);
      await signIn.getByLabel('E-mail').fill(ACCOUNTS[name].email);
      await signIn.getByLabel('Password').fill(DEMO_PASSWORD);
      await signIn.getByRole('button', { name: 'Sign in' }).click();
      await signIn.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
      const me = await (await signInContext.request.get(`${base}/api/me`)).json();
      const jobs = await signInContext.request.get(`${base}/api/jobs?pageSize=25`);
      const ids: Ids = {
        shopId: me.scope?.shopId ?? 0,
        jobId: jobs.ok() ? ((await jobs.json()).jobs?.[0]?.id ?? 0) : 0,
      };
      const storageState = await signInContext.storageState();
      await signInContext.close();
      for (const spec of specs) {
        const pagePath = typeof spec.path === 'function' ? spec.path(ids) : spec.path;
        const runs: Figures[] = [];
        for (let i = 0; i < RUNS; i++) {
          // A fresh context each time: an empty cache, as on a first visit.
          const context = await browser.newContext({
            storageState,
            viewport: { width: 1366, height: 900 },
          });
          runs.push(await measure(await context.newPage(), `${base}${pagePath}`, spec));
          await context.close();
        }
        const m = (k: keyof Figures) => median(runs.map((r) => r[k]));
        const budget = pagePath === '/network' ? BUDGET_KB['/network'] : BUDGET_KB.default;
        rows.push(
          `| ${name} | \`${pagePath}\` | ${m('gzipKb').toFixed(0)} kB ${m('gzipKb') <= budget ? '✓' : `✗ (> ${budget})`} | ${m('rawKb').toFixed(0)} kB | ${m('ttfbMs').toFixed(0)} ms | ${m('fcpMs').toFixed(0)} ms | ${m('visibleMs').toFixed(0)} ms |`,
        );
        console.error(rows.at(-1));
      }
    }
  } finally {
    await browser.close();
    if (started?.child.pid) process.kill(-started.child.pid, 'SIGTERM');
  }
  console.log(
    `\nMedian of ${RUNS} loads per page, 1366×900, Chromium; load average ${loadavg()
      .map((x) => x.toFixed(1))
      .join(' ')}\n`,
  );
  console.log(
    '| role | page | JavaScript (gzip) | JavaScript (raw) | first byte | first paint | figures visible |',
  );
  console.log(
    '| ---- | ---- | ----------------- | ---------------- | ---------- | ----------- | --------------- |',
  );
  for (const row of rows) console.log(row);
}

await main();
