// `pnpm bench`: how fast the network comparison stays on a large network. Builds a synthetic
// network (default 60 shops, 3 years, 1,000,000 jobs) in a temporary PGlite folder (or in
// --data-dir, kept for later runs), and in the PostgreSQL database given by --pg-url (the `bench`
// script passes BENCH_DATABASE_URL; an empty database is filled and left filled for reuse, and a
// kept one gets the migrations added since), then times one quarter across all shops: the API
// handler's query function; the single bare SQL aggregate reading the quarter's rows (jobs ready
// and collected, comebacks, audit samples) through the same indexes (the floor); the same kind of
// aggregate over the rows the handler reads instead (the monthly figures; the derived floor); and
// loading the quarter's rows into JS and computing there with the metrics engine (the naive way).
// Medians of several runs, taken in turn so each sees the same
// machine load, with the CPU time each used (this process, and the server's processes when it
// runs on this machine), which a busy machine disturbs less; figures are printed, never asserted.
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { sql, type Db } from '@reelwright/db';
import { migrate, openDb, type DbHandle } from '@reelwright/db/client';
import {
  comebackRate,
  compareShops,
  onTimeShare,
  rateRealisation,
  revenuePerBenchHour,
  turnaroundSummary,
  type ComebackAttribution,
} from '@reelwright/metrics';
import type { Principal } from '~/server/principal';
import { networkComparison } from '~/server/queries/network';
import { generateNetwork } from './generate';

const { values: args } = parseArgs({
  options: {
    'pg-url': { type: 'string', default: '' },
    shops: { type: 'string', default: '60' },
    years: { type: 'string', default: '3' },
    jobs: { type: 'string', default: '1000000' },
    runs: { type: 'string', default: '9' },
    'naive-runs': { type: 'string', default: '3' },
    'skip-pglite': { type: 'boolean', default: false },
    // Keep the PGlite network in this folder (built once, reused by later runs).
    'data-dir': { type: 'string', default: '' },
  },
});

const NOW = new Date('2026-12-01T12:00:00Z');
// The latest quarter whose 90-day warranty windows have all closed by NOW.
const PERIOD = { from: '2026-04-01', to: '2026-06-30' };
// Periods with warranty windows open: the current month as of NOW, and the month before it.
const CURRENT_MONTH = { from: '2026-12-01', to: '2026-12-31' };
const LAST_MONTH = { from: '2026-11-01', to: '2026-11-30' };
const WARRANTY_DAYS = 90;

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

interface Timing {
  /** Median wall-clock milliseconds. */
  ms: number;
  /** Mean CPU milliseconds a run: this process (PGlite runs inside it) plus the local server's. */
  cpu: number;
}

const processCpu = () => {
  const { user, system } = process.cpuUsage();
  return (user + system) / 1000;
};

/**
 * CPU milliseconds used so far by a PostgreSQL server running on this machine: its postmaster and
 * every child (the bench's backends among them), read from /proc. Null when the server is
 * elsewhere. On a busy machine CPU time says more than wall-clock time about the work done.
 */
async function serverCpuMeter(db: Db): Promise<(() => number) | null> {
  const { rows } = await db.execute<{ pid: number }>(sql`select pg_backend_pid() as pid`);
  const stat = (pid: number | string) => {
    try {
      const text = readFileSync(`/proc/${pid}/stat`, 'utf8');
      return {
        name: text.slice(text.indexOf('(') + 1, text.lastIndexOf(')')),
        f: text.slice(text.lastIndexOf(')') + 2).split(' '),
      };
    } catch {
      return null;
    }
  };
  // A remote server's backend pid may happen to name some local process: only trust a postgres.
  const backend = stat(rows[0]!.pid);
  if (!backend || backend.name !== 'postgres') return null;
  const postmaster = Number(backend.f[1]);
  const ticksPerMs = 100 / 1000; // USER_HZ is 100 on Linux
  return () => {
    let ticks = 0;
    for (const pid of readdirSync('/proc')) {
      if (!/^\d+$/.test(pid)) continue;
      const p = stat(pid)?.f;
      if (p && (Number(pid) === postmaster || Number(p[1]) === postmaster))
        ticks += Number(p[11]) + Number(p[12]);
    }
    return ticks / ticksPerMs;
  };
}

/** Times of several functions, run in turn so that each sees the same machine load. */
async function timeInTurn(
  runs: number,
  fns: (() => Promise<unknown>)[],
  serverCpu: (() => number) | null,
): Promise<Timing[]> {
  for (const fn of fns) await fn(); // warm caches and plans
  const wall = fns.map(() => [] as number[]);
  const cpu = fns.map(() => 0);
  const cpuNow = () => processCpu() + (serverCpu?.() ?? 0);
  for (let i = 0; i < runs; i++) {
    for (const [k, fn] of fns.entries()) {
      const c = cpuNow();
      const t = performance.now();
      await fn();
      wall[k]!.push(performance.now() - t);
      cpu[k]! += cpuNow() - c;
    }
  }
  return wall.map((w, k) => ({ ms: median(w), cpu: cpu[k]! / runs }));
}

// Each shop's quarter, [from, to + 1 day) in its own zone, as the handler reads it.
const bounds = sql`
  select x.id, (${PERIOD.from}::date::timestamp at time zone x.time_zone) as t0,
    ((${PERIOD.to}::date + 1)::timestamp at time zone x.time_zone) as t1
  from shops x`;

/**
 * The floor: one statement touching the same rows as the handler (the jobs ready in the quarter,
 * the jobs collected in it, the comebacks of those jobs, the audit samples of rounds ending in it)
 * through the same indexes, with nothing but counts and sums.
 */
async function floor(db: Db) {
  return db.execute(sql`
    with s as (${bounds})
    select s.id, r.n, r.minutes, r.money, c.n as collected, b.n as backs, a.n as samples
    from s
    cross join lateral (
      select count(*) as n, count(j.promised_at) as promised,
        sum(j.customer_turnaround_minutes + j.bench_turnaround_minutes) as minutes,
        sum(j.labour_cents + j.parts_cents - j.discount_cents + j.bench_minutes) as money
      from jobs j where j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1) r
    cross join lateral (
      select count(*) as n from jobs j
      where j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1) c
    cross join lateral (
      select count(*) as n from comebacks cb
      join jobs j on j.id = cb.original_job_id and j.shop_id = s.id
      where cb.original_shop_id = s.id and cb.detected_at >= s.t0
        and cb.detected_at < s.t1 + ${WARRANTY_DAYS * 24} * interval '1 hour'
        and j.collected_at >= s.t0 and j.collected_at < s.t1) b
    cross join lateral (
      select count(sm.id) as n from audit_rounds ar join audit_samples sm on sm.round_id = ar.id
      where ar.shop_id = s.id and ar.period_end between ${PERIOD.from}::date and ${PERIOD.to}::date) a`);
}

/**
 * The floor of the handler's own plan: one statement reading the rows the handler now reads (each
 * shop's monthly figures of the quarter, turnaround lists included, its comebacks from their
 * index, the audit samples) with nothing but counts and sums.
 */
async function derivedFloor(db: Db) {
  return db.execute(sql`
    with s as (${bounds})
    select s.id, m.n, m.ready, m.collected, m.chars, b.n as backs, a.n as samples
    from s
    cross join lateral (
      select count(*) as n, sum(f.jobs_ready + f.customer_n + f.bench_n + f.promised + f.on_time)
          as ready,
        sum(f.collected + f.customer_total + f.bench_total + f.revenue_cents + f.labour_cents
          + f.bench_minutes) as collected,
        sum(length(f.customer_minutes) + length(f.bench_turnarounds)) as chars
      from shop_month_figures f
      where f.shop_id = s.id and f.month >= ${PERIOD.from}::date and f.month <= ${PERIOD.to}::date) m
    cross join lateral (
      select count(*) as n from comebacks cb
      where cb.original_shop_id = s.id and cb.original_collected_at >= s.t0
        and cb.original_collected_at < s.t1) b
    cross join lateral (
      select count(sm.id) as n from audit_rounds ar join audit_samples sm on sm.round_id = ar.id
      where ar.shop_id = s.id and ar.period_end between ${PERIOD.from}::date and ${PERIOD.to}::date) a`);
}

type Row = Record<string, unknown>;
const toDate = (v: unknown) => (v == null ? null : new Date(v as string | Date));

/** The naive way: fetch the period's rows and compute every figure in JS with the metrics engine. */
async function naive(db: Db) {
  const ready = await db.execute<Row>(sql`
    with s as (${bounds})
    select j.shop_id, j.customer_turnaround_minutes as c, j.bench_turnaround_minutes as b,
      j.ready_at, j.promised_at, j.labour_cents, j.parts_cents, j.discount_cents, j.bench_minutes
    from s join jobs j on j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1`);
  const collected = await db.execute<Row>(sql`
    with s as (${bounds})
    select j.id, j.shop_id, j.collected_at, cb.attribution::text as attribution, cb.detected_at
    from s join jobs j on j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1
    left join comebacks cb on cb.original_job_id = j.id and cb.status = 'confirmed'`);
  const audits = await db.execute<Row>(sql`
    select ar.shop_id, sm.verdict::text as verdict from audit_rounds ar
    join audit_samples sm on sm.round_id = ar.id
    where ar.period_end between ${PERIOD.from}::date and ${PERIOD.to}::date`);
  const shopRows = await db.execute<Row>(sql`select id, labour_rate_cents from shops order by id`);
  const byShop = <T>(rows: Row[], f: (r: Row) => T) => {
    const m = new Map<number, T[]>();
    for (const r of rows) {
      const k = Number(r.shop_id);
      const list = m.get(k) ?? [];
      list.push(f(r));
      m.set(k, list);
    }
    return m;
  };
  const readyBy = byShop(ready.rows, (r) => r);
  const jobsBy = new Map<
    number,
    Map<
      number,
      { collectedAt: Date; comebacks: { attribution: ComebackAttribution; reportedAt: Date }[] }
    >
  >();
  for (const r of collected.rows) {
    const shop = jobsBy.get(Number(r.shop_id)) ?? new Map();
    jobsBy.set(Number(r.shop_id), shop);
    const job = shop.get(Number(r.id)) ?? { collectedAt: toDate(r.collected_at)!, comebacks: [] };
    shop.set(Number(r.id), job);
    if (r.attribution)
      job.comebacks.push({
        attribution: r.attribution as ComebackAttribution,
        reportedAt: toDate(r.detected_at)!,
      });
  }
  const auditsBy = byShop(audits.rows, (r) => r.verdict);
  const out = shopRows.rows.map((s) => {
    const id = Number(s.id);
    const rows = readyBy.get(id) ?? [];
    const n = (v: unknown) => Number(v ?? 0);
    const money = rows.map((r) => ({
      revenueCents: n(r.labour_cents) + n(r.parts_cents) - n(r.discount_cents),
      labourCents: n(r.labour_cents),
      benchMinutes: n(r.bench_minutes),
    }));
    const verdicts = auditsBy.get(id) ?? [];
    return {
      id,
      jobsReady: rows.length,
      customer: turnaroundSummary(rows.filter((r) => r.c != null).map((r) => n(r.c))),
      bench: turnaroundSummary(rows.filter((r) => r.b != null).map((r) => n(r.b))),
      onTime: onTimeShare(
        rows.map((r) => ({ readyAt: toDate(r.ready_at), promisedAt: toDate(r.promised_at) })),
      ),
      perHour: revenuePerBenchHour(money),
      realisation: rateRealisation(money, n(s.labour_rate_cents)),
      comebacks: comebackRate([...(jobsBy.get(id)?.values() ?? [])], {
        asOf: NOW,
        warrantyDays: WARRANTY_DAYS,
      }),
      audits: {
        events: verdicts.filter((v) => v !== 'meets_standard').length,
        trials: verdicts.length,
      },
    };
  });
  compareShops(out.map((s) => ({ shopId: String(s.id), ...s.comebacks })));
  compareShops(out.map((s) => ({ shopId: String(s.id), ...s.audits })));
  return { out, rows: ready.rows.length + collected.rows.length + audits.rows.length };
}

async function measure(label: string, handle: DbHandle) {
  const db = handle.db;
  const owner: Principal = {
    id: 1,
    name: 'Bench owner',
    email: 'bench-owner@bench.test',
    role: 'owner',
    shopId: null,
    regionId: null,
    scope: { kind: 'network' },
  };
  const runs = Number(args.runs);
  const load = () =>
    loadavg()
      .map((l) => l.toFixed(2))
      .join(', ');
  console.log(`\n${label}: measuring; machine load (1, 5, 15 min) ${load()}`);
  const meter = handle.driver === 'pg' ? await serverCpuMeter(db) : null;
  const comparison = () => networkComparison(owner, PERIOD, { db, asOf: NOW });
  const [handler, bare, derived] = (await timeInTurn(
    runs,
    [comparison, () => floor(db), () => derivedFloor(db)],
    meter,
  )) as [Timing, Timing, Timing];
  // Open periods: the network reference curve (twelve months before) is kept for a while per
  // database, so a request normally finds it; timed also rebuilt on every run.
  const open =
    (period: typeof PERIOD, referenceCache = true) =>
    () =>
      networkComparison(owner, period, { db, asOf: NOW, referenceCache });
  const [current, last, currentCold, lastCold] = (await timeInTurn(
    runs,
    [open(CURRENT_MONTH), open(LAST_MONTH), open(CURRENT_MONTH, false), open(LAST_MONTH, false)],
    meter,
  )) as [Timing, Timing, Timing, Timing];
  let loaded = 0;
  const [slow, handlerAgain] = (await timeInTurn(
    Number(args['naive-runs']),
    [
      async () => {
        loaded = (await naive(db)).rows;
      },
      comparison,
    ],
    meter,
  )) as [Timing, Timing];

  // The handler and the naive way must agree, or the comparison means nothing.
  const fast = await networkComparison(owner, PERIOD, { db, asOf: NOW });
  const check = (await naive(db)).out;
  for (const s of fast.shops) {
    const n = check.find((c) => c.id === s.shop.id)!;
    const same =
      s.comebacks.events === n.comebacks.events &&
      s.comebacks.trials === n.comebacks.trials &&
      s.jobsReady === n.jobsReady &&
      s.onTime.onTime === n.onTime.onTime &&
      s.audits.events === n.audits.events &&
      Math.abs((s.customerTurnaround.p90 ?? 0) - (n.customer.p90 ?? 0)) < 1e-6 &&
      Math.abs((s.customerTurnaround.median ?? 0) - (n.customer.median ?? 0)) < 1e-6 &&
      Math.abs((s.benchTurnaround.median ?? 0) - (n.bench.median ?? 0)) < 1e-6 &&
      Math.abs((s.benchTurnaround.p90 ?? 0) - (n.bench.p90 ?? 0)) < 1e-6 &&
      Math.abs((s.revenue.perBenchHourCents ?? 0) - (n.perHour ?? 0)) < 1e-6;
    if (!same) throw new Error(`${label}: handler and naive figures differ for shop ${s.shop.id}`);
  }
  const { rows } = await db.execute<{ n: number | string }>(sql`select count(*) as n from jobs`);
  console.log(
    `${label}: ${Number(rows[0]!.n).toLocaleString('en-US')} jobs, ${fast.shops.length} shops, quarter ${PERIOD.from} – ${PERIOD.to}; load now ${load()}`,
  );
  console.log(
    `  rows the quarter reads:     ${loaded.toLocaleString('en-US')} (jobs ready, jobs collected with comebacks, audit samples)`,
  );
  const cpuNote =
    handle.driver === 'pg' && !meter ? ' (server not on this machine: bench only)' : '';
  const line = (name: string, t: Timing, n: number | string) =>
    console.log(
      `  ${name.padEnd(27)} ${t.ms.toFixed(1)} ms (median of ${n}); CPU ${t.cpu.toFixed(1)} ms a run${cpuNote}`,
    );
  line('API handler query function:', handler, runs);
  line('bare SQL aggregate (floor):', bare, runs);
  line('floor of the derived rows:', derived, runs);
  line('naive load + JS compute:', slow, args['naive-runs']!);
  line('handler, current month:', current, runs);
  line('handler, last month:', last, runs);
  line('current, reference rebuilt:', currentCold, runs);
  line('last, reference rebuilt:', lastCold, runs);
  console.log(
    `  handler ÷ floor:            ${(handler.ms / bare.ms).toFixed(2)}×  (target ≤ 2×; CPU ${(handler.cpu / bare.cpu).toFixed(2)}×)`,
  );
  console.log(
    `  handler ÷ derived floor:    ${(handler.ms / derived.ms).toFixed(2)}×  (CPU ${(handler.cpu / derived.cpu).toFixed(2)}×)`,
  );
  console.log(
    `  naive ÷ handler:            ${(slow.ms / handler.ms).toFixed(1)}×  (target ≥ 20×; CPU ${(slow.cpu / handler.cpu).toFixed(1)}×; handler timed beside it: ${handlerAgain.ms.toFixed(1)} ms)`,
  );
  return { label, handler, bare, derived, slow, current, last };
}

async function isEmpty(handle: DbHandle) {
  const { rows } = await handle.db.execute<{ n: number | string }>(
    sql`select count(*) as n from information_schema.tables where table_schema = 'public'`,
  );
  return Number(rows[0]?.n ?? 0) === 0;
}

async function isBenchNetwork(handle: DbHandle) {
  const { rows } = await handle.db.execute<{ n: number | string }>(
    sql`select count(*) as n from users where email = 'bench-owner@bench.test'`,
  );
  return Number(rows[0]?.n ?? 0) === 1;
}

/** A network kept from an earlier run gets the migrations added since, so it measures today's schema. */
async function catchUp(handle: DbHandle, label: string) {
  const applied = await migrate(handle.db, handle.driver);
  if (applied > 0) {
    await handle.db.execute(sql`vacuum analyze`);
    console.log(`${label}: applied ${applied} new migration(s) to the kept network`);
  }
}

async function build(handle: DbHandle, label: string) {
  await migrate(handle.db, handle.driver);
  const t = performance.now();
  const total = Number(args.jobs);
  let last = 0;
  const result = await generateNetwork(handle.db, {
    shops: Number(args.shops),
    years: Number(args.years),
    jobs: total,
    now: NOW,
    onProgress: (done) => {
      if (done - last >= total / 10 || done === total) {
        last = done;
        process.stdout.write(
          `\r${label}: generated ${done.toLocaleString('en-US')} of ${total.toLocaleString('en-US')} jobs`,
        );
      }
    },
  });
  console.log(`\n${label}: built in ${((performance.now() - t) / 1000).toFixed(0)} s`);
  return result;
}

async function main() {
  const results = [];
  if (!args['skip-pglite']) {
    const keep = args['data-dir'];
    const folder = keep || mkdtempSync(path.join(tmpdir(), 'reelwright-bench-'));
    const handle = await openDb({ dataDir: path.join(folder, 'pglite') });
    try {
      if (await isEmpty(handle)) await build(handle, 'PGlite');
      else if (!(await isBenchNetwork(handle)))
        throw new Error(`${folder} holds another database.`);
      else await catchUp(handle, 'PGlite');
      results.push(await measure('PGlite', handle));
    } finally {
      await handle.close();
      if (!keep) rmSync(folder, { recursive: true, force: true });
    }
  }
  if (args['pg-url']) {
    const handle = await openDb({ url: args['pg-url'], maxConnections: 4 });
    try {
      // An empty database is filled (and left filled); one already holding the network is reused.
      if (await isEmpty(handle)) await build(handle, 'PostgreSQL');
      else if (!(await isBenchNetwork(handle))) {
        throw new Error(
          'BENCH_DATABASE_URL must name an empty database (or one an earlier run filled).',
        );
      } else await catchUp(handle, 'PostgreSQL');
      results.push(await measure('PostgreSQL', handle));
    } finally {
      await handle.close();
    }
  } else {
    console.log('\n(Set BENCH_DATABASE_URL to an empty PostgreSQL database to measure there too.)');
  }
  console.log(
    '\nsummary: engine | handler | floor | derived floor | naive (ms, medians) | handler÷floor | handler÷derived floor | naive÷handler | the same ratios in CPU time | handler, current month | handler, last month',
  );
  for (const r of results) {
    console.log(
      `  ${r.label} | ${r.handler.ms.toFixed(1)} | ${r.bare.ms.toFixed(1)} | ${r.derived.ms.toFixed(1)} | ${r.slow.ms.toFixed(1)} | ${(r.handler.ms / r.bare.ms).toFixed(2)} | ${(r.handler.ms / r.derived.ms).toFixed(2)} | ${(r.slow.ms / r.handler.ms).toFixed(1)} | CPU ${(r.handler.cpu / r.bare.cpu).toFixed(2)} | ${(r.handler.cpu / r.derived.cpu).toFixed(2)} | ${(r.slow.cpu / r.handler.cpu).toFixed(1)} | ${r.current.ms.toFixed(1)} | ${r.last.ms.toFixed(1)}`,
    );
  }
  console.log(
    `  machine load (1, 5, 15 min): ${loadavg()
      .map((l) => l.toFixed(2))
      .join(', ')}`,
  );
}

await main();
