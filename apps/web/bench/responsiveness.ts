// `pnpm bench:responsiveness`: does the server stay responsive while a large CSV import runs?
// Seeds the demo network into a fresh PGlite folder (or copies --data-dir, a folder seeded once),
// starts the built server (`next start`, so build first), signs in as a shop lead and imports a
// 66,000-row file while GET /api/health and GET /api/jobs (the bench list) are sent every 50 ms.
// Prints their latency during the import and the import's duration, then, with the server
// stopped, times PostgreSQL COPY of the very rows the import wrote on the same engine (in a
// transaction rolled back). Figures are printed, never asserted.
import { spawn, type ChildProcess } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import http from 'node:http';
import { createServer } from 'node:net';
import { loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { openDb, runMigrations } from '@reelwright/db/client';
import { DEFAULT_SEED, DEMO_PASSWORD, isEmpty, seedDemo } from '@reelwright/db/seed';
import { identityMapping, importRows, toCsv } from '~/server/imports/fixture';
import { IMPORTED_TABLES, timeCopyPg, timeCopyPglite } from './copy-timing';

const { values: args } = parseArgs({
  options: {
    rows: { type: 'string', default: '66000' },
    // A PostgreSQL database instead of PGlite (the script passes BENCH_DATABASE_URL): seeded when
    // empty, and left seeded (each run imports new job numbers).
    'pg-url': { type: 'string', default: '' },
    'poll-ms': { type: 'string', default: '50' },
    // A folder seeded by an earlier run (kept with --keep): copied, so every run starts the same.
    'data-dir': { type: 'string', default: '' },
    keep: { type: 'boolean', default: false },
  },
});

const ROWS = Number(args.rows);
const POLL_MS = Number(args['poll-ms']);
const IDLE_MS = 5_000;
const PG_URL = args['pg-url'];
const LEAD = 'lead.marram@saltwick.test';
const TECH = 'tech.marram@saltwick.test';
const webDir = path.resolve(import.meta.dirname, '..');

const quantile = (sorted: number[], p: number) =>
  sorted.length ? sorted[Math.min(sorted.length - 1, Math.ceil(p * sorted.length) - 1)]! : NaN;
const ms = (x: number) => `${x.toFixed(0)} ms`;

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

async function seed(options: { dataDir?: string; url?: string }) {
  const handle = await openDb(options);
  try {
    await runMigrations(handle);
    if (!(await isEmpty(handle.db))) return console.log('› the database is seeded already');
    const t0 = performance.now();
    await seedDemo(handle.db, { seed: DEFAULT_SEED, years: 2, now: new Date() });
    console.log(`› seeded the demo network in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  } finally {
    await handle.close();
  }
}

function startServer(dataDir: string, url: string, port: number): ChildProcess {
  const child = spawn(
    process.execPath,
    [
      'node_modules/next/dist/bin/next',
      'start',
      '--hostname',
      '127.0.0.1',
      '--port',
      String(port),
      // As the demo and the end-to-end server: idle connections outlive the client's.
      '--keepAliveTimeout',
      '65000',
    ],
    {
      cwd: webDir,
      env: {
        // eslint-disable-next-line no-restricted-properties -- the server child needs PATH and the like
        ...process.env,
        NODE_ENV: 'production',
        DATABASE_URL: url,
        PGLITE_DATA_DIR: dataDir,
        NEXTAUTH_SECRET: 'responsiveness-benchmark-only-secret-0123',
        NEXTAUTH_URL: `http://127.0.0.1:${port}`,
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  child.stderr!.on('data', (chunk: Buffer) => process.stderr.write(`  [server] ${chunk}`));
  return child;
}

async function waitHealthy(base: string, server: ChildProcess) {
  for (let i = 0; i < 600; i++) {
    if (server.exitCode !== null) throw new Error(`the server exited with ${server.exitCode}`);
    try {
      if ((await fetch(`${base}/api/health`)).ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error('the server did not become healthy');
}

async function signIn(base: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const jar = new Map<string, string>();
  const keep = (response: Response) => {
    for (const cookie of response.headers.getSetCookie()) {
      const [pair] = cookie.split(';');
      const at = pair!.indexOf('=');
      jar.set(pair!.slice(0, at), pair!.slice(at + 1));
    }
  };
  keep(csrf);
  const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const response = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: {
      'content-type': 'application/x-www-form-urlencoded',
      origin: base,
      cookie: cookie(),
    },
    body: new URLSearchParams({ csrfToken, email: LEAD, password: DEMO_PASSWORD, json: 'true' }),
  });
  keep(response);
  const me = await fetch(`${base}/api/me`, { headers: { cookie: cookie() } });
  if (!me.ok) throw new Error(`signing in as ${LEAD} failed (${me.status})`);
  return cookie();
}

interface Poller {
  latencies: number[];
  /** When each request was sent (performance.now()) and how long it took. */
  samples: { at: number; ms: number }[];
  failures: number;
  stop(): Promise<void>;
}

/** Sends a request every `POLL_MS` whether or not the previous one has answered. */
function poll(url: string, headers: Record<string, string>): Poller {
  const latencies: number[] = [];
  const samples: { at: number; ms: number }[] = [];
  const inFlight = new Set<Promise<void>>();
  let failures = 0;
  const timer = setInterval(() => {
    const started = performance.now();
    const request = fetch(url, { headers })
      .then(async (response) => {
        await response.arrayBuffer();
        if (!response.ok) failures++;
        latencies.push(performance.now() - started);
        samples.push({ at: started, ms: performance.now() - started });
      })
      .catch(() => {
        failures++;
      })
      .finally(() => inFlight.delete(request));
    inFlight.add(request);
  }, POLL_MS);
  return {
    latencies,
    samples,
    get failures() {
      return failures;
    },
    async stop() {
      clearInterval(timer);
      await Promise.all([...inFlight]);
    },
  };
}

function summary(name: string, p: Poller) {
  const sorted = [...p.latencies].sort((a, b) => a - b);
  return `${name.padEnd(22)} ${String(sorted.length).padStart(5)} requests  p50 ${ms(quantile(sorted, 0.5)).padStart(8)}  p99 ${ms(quantile(sorted, 0.99)).padStart(8)}  max ${ms(sorted.at(-1) ?? NaN).padStart(8)}${p.failures ? `  (${p.failures} failed)` : ''}`;
}

/** The import's steps as its progress lines announce them, with when each first arrived. */
function phaseLog() {
  const marks: { at: number; step: string }[] = [];
  let parsed = 0;
  return {
    marks,
    seen(data: string) {
      const lines = data.split('\n');
      for (; parsed < lines.length - 1; parsed++) {
        const line = JSON.parse(lines[parsed]!) as {
          progress?: { step: string; done: number; total: number };
        };
        const p = line.progress;
        const step = !p
          ? (Object.keys(line)[0] ?? '?')
          : p.step === 'jobs' && p.done === p.total
            ? 'all jobs stored; figures and statistics'
            : p.step;
        if (marks.at(-1)?.step !== step) marks.push({ at: performance.now(), step });
      }
    },
  };
}

/** The steps, and every request slower than 250 ms placed among them. */
function timeline(t0: number, marks: { at: number; step: string }[], pollers: Poller[]) {
  const s = (at: number) => ((at - t0) / 1000).toFixed(2).padStart(7);
  const slow = pollers
    .flatMap((p, i) => p.samples.filter((x) => x.ms > 250).map((x) => ({ ...x, i })))
    .filter((x) => x.at >= t0)
    .sort((a, b) => a.at - b.at);
  const events = [
    ...marks.map((m) => ({ at: m.at, line: `${s(m.at)}  ── ${m.step}` })),
    ...slow.map((x) => ({
      at: x.at,
      line: `${s(x.at)}  ${x.i === 0 ? 'health' : 'list  '} ${ms(x.ms)}`,
    })),
  ].sort((a, b) => a.at - b.at);
  return events.map((e) => e.line);
}

async function main() {
  const root = mkdtempSync(path.join(tmpdir(), 'rw-responsiveness-'));
  const dataDir = path.join(root, 'pglite');
  let server: ChildProcess | null = null;
  try {
    if (PG_URL) {
      await seed({ url: PG_URL });
    } else if (args['data-dir'] && existsSync(args['data-dir'])) {
      cpSync(args['data-dir'], dataDir, { recursive: true });
      rmSync(path.join(dataDir, '.reelwright.lock'), { force: true });
      console.log(`› copied the seeded folder ${args['data-dir']}`);
    } else {
      await seed({ dataDir });
      if (args['data-dir']) cpSync(dataDir, args['data-dir'], { recursive: true });
    }

    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    server = startServer(dataDir, PG_URL, port);
    // Stopped with Ctrl-C, the bench takes its server down with it.
    for (const signal of ['SIGINT', 'SIGTERM'] as const) {
      process.once(signal, () => {
        server?.kill('SIGTERM');
        process.exit(130);
      });
    }
    await waitHealthy(base, server);
    const cookie = await signIn(base);

    const rows = importRows(ROWS, `RESP${Date.now()}`).map((row) => ({
      ...row,
      technician_email: row.technician_email ? TECH : '',
    }));
    const csv = new TextEncoder().encode(toCsv(rows));
    console.log(
      `› importing ${ROWS.toLocaleString('en-US')} rows (${(csv.length / 1e6).toFixed(1)} MB) as ${LEAD}, polling every ${POLL_MS} ms; load ${loadavg()[0]!.toFixed(2)}`,
    );

    // Warm both routes so the first compile-free request is not counted.
    await fetch(`${base}/api/health`);
    await fetch(`${base}/api/jobs`, { headers: { cookie } });

    // The same polling with nothing else running: what the figures during the import compare to.
    const idleHealth = poll(`${base}/api/health`, {});
    const idleList = poll(`${base}/api/jobs`, { cookie });
    await new Promise((r) => setTimeout(r, IDLE_MS));
    await Promise.all([idleHealth.stop(), idleList.stop()]);

    // The upload's body is encoded before the polling starts: encoding 20 MB holds this script's
    // own thread, which would count against the server's answers.
    const form = new FormData();
    form.set('file', new Blob([csv], { type: 'text/csv' }), 'responsiveness.csv');
    form.set('mapping', JSON.stringify(identityMapping));
    const encoded = new Response(form);
    const payload = Buffer.from(await encoded.arrayBuffer());

    const health = poll(`${base}/api/health`, {});
    const list = poll(`${base}/api/jobs`, { cookie });
    const t0 = performance.now();
    const phases = phaseLog();
    // node:http rather than fetch, whose 300 s wait for headers a loaded machine can exceed.
    const { status, text } = await new Promise<{ status: number; text: string }>(
      (resolve, reject) => {
        const request = http.request(
          `${base}/api/imports/jobs`,
          {
            method: 'POST',
            headers: {
              cookie,
              origin: base,
              accept: 'application/x-ndjson',
              'content-type': encoded.headers.get('content-type')!,
              'content-length': String(payload.length),
            },
          },
          (answer) => {
            let data = '';
            answer.setEncoding('utf8');
            answer.on('data', (chunk: string) => {
              data += chunk;
              phases.seen(data);
            });
            answer.on('end', () => resolve({ status: answer.statusCode ?? 0, text: data }));
          },
        );
        request.on('error', reject);
        request.end(payload);
      },
    );
    const importMs = performance.now() - t0;
    await Promise.all([health.stop(), list.stop()]);
    const last = JSON.parse(text.trim().split('\n').at(-1) ?? '{}') as {
      done?: { batchId: number; imported: number };
    };
    const body = last.done;
    if (status !== 200 || !body) {
      throw new Error(`the import answered ${status}: ${text.slice(-500)}`);
    }

    console.log(`\nWith nothing else running (${IDLE_MS / 1000} s):`);
    console.log(summary('GET /api/health', idleHealth));
    console.log(summary('GET /api/jobs (lead)', idleList));
    console.log(`\nDuring the import (${PG_URL ? 'PostgreSQL' : 'PGlite'}):`);
    console.log(summary('GET /api/health', health));
    console.log(summary('GET /api/jobs (lead)', list));
    console.log(`import: ${(importMs / 1000).toFixed(2)} s (request to answer); now COPY…`);
    console.log(`\nWhere the time went (seconds from the upload's start):`);
    for (const line of timeline(t0, phases.marks, [health, list])) console.log(line);
    server.kill('SIGTERM');
    await new Promise((r) => server!.once('exit', r));
    server = null;
    const copy = PG_URL
      ? await timeCopyPg(PG_URL, body.batchId)
      : await timeCopyPglite(dataDir, body.batchId);

    console.log(
      `\nimport: ${body.imported?.toLocaleString('en-US')} jobs, ${copy.rows.toLocaleString('en-US')} rows written in ${(importMs / 1000).toFixed(2)} s (request to answer)`,
    );
    console.log(
      `COPY of the same ${copy.rows.toLocaleString('en-US')} rows (${IMPORTED_TABLES.join(', ')}), same engine and triggers: ${(copy.copyMs / 1000).toFixed(2)} s`,
    );
    const p99 = (p: Poller) =>
      quantile(
        [...p.latencies].sort((a, b) => a - b),
        0.99,
      );
    console.log(`import speed ÷ COPY speed: ${(copy.copyMs / importMs).toFixed(2)}`);
    console.log(
      `\ntargets: p99 during the import ≤ 250 ms (health ${ms(p99(health))}, bench list ${ms(p99(list))}); ` +
        `import ≥ 0.33 of COPY speed (${(copy.copyMs / importMs).toFixed(2)})`,
    );
  } finally {
    if (server) {
      server.kill('SIGKILL');
      await new Promise((r) => server!.once('exit', r));
    }
    if (!args.keep) rmSync(root, { recursive: true, force: true });
  }
}

await main();
