import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runMigrations, type Db, type DbHandle } from './client';
import { freshDb, TARGET } from './test/databases';

// shop_month_figures and comebacks.original_collected_at are kept by triggers (migration 0003).
// After every kind of write, the table must equal the months computed here, in JS, from the jobs.

type JobRow = {
  shop_id: number;
  time_zone: string;
  ready_at: Date | null;
  collected_at: Date | null;
  promised_at: Date | null;
  c: number | null;
  b: number | null;
  labour_cents: number;
  parts_cents: number;
  discount_cents: number;
  bench_minutes: number | null;
};

const monthOf = (at: Date, zone: string) => format(new TZDate(at, zone), 'yyyy-MM-01');
const list = (values: number[]) =>
  [...values]
    .sort((x, y) => x - y)
    .map((v) => String(v).padStart(7, '0'))
    .join('');

async function expectedMonths(db: Db) {
  const { rows } = await db.execute<JobRow>(sql`
    select j.shop_id, s.time_zone, j.ready_at, j.collected_at, j.promised_at,
      j.customer_turnaround_minutes as c, j.bench_turnaround_minutes as b,
      j.labour_cents, j.parts_cents, j.discount_cents, j.bench_minutes
    from jobs j join shops s on s.id = j.shop_id`);
  const months = new Map<string, { ready: JobRow[]; collected: number }>();
  const at = (shop: number, month: string) => {
    const key = `${shop}|${month}`;
    if (!months.has(key)) months.set(key, { ready: [], collected: 0 });
    return months.get(key)!;
  };
  for (const j of rows) {
    if (j.ready_at) at(j.shop_id, monthOf(new Date(j.ready_at), j.time_zone)).ready.push(j);
    if (j.collected_at) at(j.shop_id, monthOf(new Date(j.collected_at), j.time_zone)).collected++;
  }
  const sum = (js: JobRow[], f: (j: JobRow) => number) => js.reduce((t, j) => t + f(j), 0);
  return [...months]
    .map(([key, { ready, collected }]) => {
      const [shop, month] = key.split('|');
      const cs = ready.flatMap((j) => (j.c === null ? [] : [Number(j.c)]));
      const bs = ready.flatMap((j) => (j.b === null ? [] : [Number(j.b)]));
      return {
        shop: Number(shop),
        month,
        jobsReady: ready.length,
        customerN: cs.length,
        customerTotal: sum(ready, (j) => Number(j.c ?? 0)),
        customerMinutes: list(cs),
        benchN: bs.length,
        benchTotal: sum(ready, (j) => Number(j.b ?? 0)),
        benchTurnarounds: list(bs),
        waitingMinutes: sum(ready, (j) =>
          j.c === null || j.b === null ? 0 : Number(j.c) - Number(j.b),
        ),
        promised: ready.filter((j) => j.promised_at).length,
        onTime: ready.filter((j) => j.promised_at && j.ready_at! <= j.promised_at).length,
        revenueCents: sum(ready, (j) => j.labour_cents + j.parts_cents - j.discount_cents),
        labourCents: sum(ready, (j) => j.labour_cents),
        benchMinutes: sum(ready, (j) => Number(j.bench_minutes ?? 0)),
        collected,
      };
    })
    .sort((x, y) => x.shop - y.shop || x.month!.localeCompare(y.month!));
}

async function storedMonths(db: Db) {
  const { rows } = await db.execute(sql`
    select shop_id as shop, to_char(month, 'YYYY-MM-DD') as month, jobs_ready as "jobsReady",
      customer_n as "customerN", customer_total::float8 as "customerTotal",
      customer_minutes as "customerMinutes", bench_n as "benchN",
      bench_total::float8 as "benchTotal", bench_turnarounds as "benchTurnarounds",
      waiting_minutes::float8 as "waitingMinutes", promised, on_time as "onTime",
      revenue_cents::float8 as "revenueCents", labour_cents::float8 as "labourCents",
      bench_minutes::float8 as "benchMinutes", collected
    from shop_month_figures order by shop_id, month`);
  return rows;
}

describe(`derived monthly figures (${TARGET})`, () => {
  let handle: DbHandle;
  let db: Db;
  const agree = async () => expect(await storedMonths(db)).toEqual(await expectedMonths(db));

  beforeAll(async () => {
    handle = await freshDb();
    db = handle.db;
    await runMigrations(handle);
    await db.execute(sql`insert into regions (id, name, code) values (1, 'Coast', 'C')`);
    await db.execute(sql`
      insert into shops (id, region_id, name, slug, time_zone, opening_hours, labour_rate_cents,
        royalty_rate_bp)
      values (1, 1, 'Harbour', 'harbour', 'America/New_York', '{}', 6000, 600),
        (2, 1, 'Quay', 'quay', 'Europe/Lisbon', '{}', 5000, 600)`);
    await db.execute(
      sql`insert into customers (id, shop_id, name) values (1, 1, 'A'), (2, 2, 'B')`,
    );
    await db.execute(sql`
      insert into reels (id, customer_id, kind, maker, model)
      values (1, 1, 'spinning', 'Maker', 'M1'), (2, 2, 'baitcasting', 'Maker', 'M2')`);
  }, 60_000);
  afterAll(async () => handle?.close());

  it('follow inserts of many jobs in one statement, across a local month boundary', async () => {
    // 03:30 UTC on 1 May is still 30 April in New York (UTC−4) but 1 May in Lisbon (UTC+1).
    await db.execute(sql`
      insert into jobs (id, shop_id, customer_id, reel_id, service_type, state, checked_in_at,
        promised_at, ready_at, collected_at, labour_cents, parts_cents, discount_cents,
        customer_turnaround_minutes, bench_turnaround_minutes, bench_minutes)
      values
        (1, 1, 1, 1, 'overhaul', 'collected', '2026-04-20T14:00Z', '2026-04-25T14:00Z',
          '2026-04-24T15:00Z', '2026-05-01T03:30Z', 4500, 1200, 0, 1260, 1200, 75),
        (2, 1, 1, 1, 'overhaul', 'ready', '2026-04-28T14:00Z', '2026-04-30T14:00Z',
          '2026-05-01T03:30Z', null, 3000, 0, 500, 600, 600, 40),
        (3, 2, 2, 2, 'tune_up', 'ready', '2026-04-28T09:00Z', null,
          '2026-05-01T03:30Z', null, 2500, 0, 0, 1440, 960, null),
        (4, 2, 2, 2, 'tune_up', 'on_bench', '2026-05-02T09:00Z', null, null, null,
          0, 0, 0, null, null, null)`);
    await agree();
    const { rows } = await db.execute<{ shop_id: number; month: string }>(
      sql`select shop_id, to_char(month, 'YYYY-MM') as month from shop_month_figures order by 1, 2`,
    );
    expect(rows.map((r) => `${r.shop_id} ${r.month}`)).toEqual(['1 2026-04', '2 2026-05']);
  });

  it('follow updates: a job becoming ready, money and bench time, a collection, a move', async () => {
    await db.execute(sql`
      update jobs set state = 'ready', ready_at = '2026-06-03T10:00Z',
        customer_turnaround_minutes = 2880, bench_turnaround_minutes = 2400, bench_minutes = 90
      where id = 4`);
    await agree();
    await db.execute(sql`update jobs set parts_cents = 800, bench_minutes = 55 where id = 2`);
    await agree();
    await db.execute(
      sql`update jobs set state = 'collected', collected_at = '2026-06-30T23:30Z' where id = 3`,
    );
    await agree();
    // A job recorded at the wrong shop is moved: both shops' months change.
    await db.execute(sql`update jobs set shop_id = 2, customer_id = 2, reel_id = 2 where id = 2`);
    await agree();
    // An update touching nothing the figures use leaves them as they were.
    await db.execute(sql`update jobs set findings = 'Worn drag washer' where id = 1`);
    await agree();
  });

  it('follow deletes, and rebuild when a shop changes time zone', async () => {
    await db.execute(sql`delete from jobs where id = 4`);
    await agree();
    await db.execute(sql`update shops set time_zone = 'UTC' where id = 1`);
    await agree();
    const { rows } = await db.execute<{ month: string }>(
      sql`select to_char(month, 'YYYY-MM') as month from shop_month_figures where shop_id = 1 order by 1`,
    );
    // In UTC job 1 is still ready in April but collected on 1 May.
    expect(rows.map((r) => r.month)).toEqual(['2026-04', '2026-05']);
  });

  it('copies the original job’s collection time onto its comebacks, and keeps it current', async () => {
    await db.execute(sql`
      insert into jobs (id, shop_id, customer_id, reel_id, service_type, state, checked_in_at)
      values (5, 1, 1, 1, 'repair', 'checked_in', '2026-06-10T14:00Z')`);
    await db.execute(sql`
      insert into comebacks (job_id, original_job_id, original_shop_id, detected_at,
        days_since_collection)
      values (5, 1, 1, '2026-06-10T14:00Z', 40)`);
    const collectedAt = async () =>
      (
        await db.execute<{ at: Date | string }>(
          sql`select original_collected_at as at from comebacks where job_id = 5`,
        )
      ).rows[0]!.at;
    expect(new Date(await collectedAt()).toISOString()).toBe('2026-05-01T03:30:00.000Z');
    await db.execute(sql`update jobs set collected_at = '2026-05-02T16:00Z' where id = 1`);
    expect(new Date(await collectedAt()).toISOString()).toBe('2026-05-02T16:00:00.000Z');
    await agree();
  });

  // PGlite has one connection; on a server two transactions can write the same shop-month.
  it.runIf(TARGET === 'pg')(
    'let two transactions writing one shop-month at once both commit, and count both',
    async () => {
      let updated!: () => void;
      const firstUpdated = new Promise<void>((r) => (updated = r));
      let release!: () => void;
      const held = new Promise<void>((r) => (release = r));
      const first = db.transaction(async (tx) => {
        await tx.execute(sql`update jobs set labour_cents = labour_cents + 100 where id = 2`);
        updated();
        await held;
      });
      await firstUpdated;
      // Job 3 is ready in the same shop and month as job 2; its update waits for the first
      // transaction to commit, then recomputes the month with both changes.
      const second = db.execute(sql`update jobs set parts_cents = parts_cents + 50 where id = 3`);
      setTimeout(release, 300);
      await Promise.all([first, second]);
      await agree();
    },
  );

  it('wait, in a transaction that defers them, until the months are recomputed (bulk loads)', async () => {
    const before = await storedMonths(db);
    await db.transaction(async (tx) => {
      await tx.execute(sql`set local reelwright.defer_figures = 'on'`);
      await tx.execute(sql`
        insert into jobs (id, shop_id, customer_id, reel_id, service_type, state, checked_in_at,
          ready_at, labour_cents, parts_cents, discount_cents, customer_turnaround_minutes,
          bench_turnaround_minutes)
        values (6, 1, 1, 1, 'overhaul', 'ready', '2026-07-01T14:00Z', '2026-07-03T15:00Z',
          4000, 0, 0, 1500, 1500)`);
    });
    // Deferred: July has no row yet, and nothing else changed.
    expect(await storedMonths(db)).toEqual(before);
    // The setting was the transaction's own: the next write is followed again.
    await db.execute(sql`update jobs set labour_cents = 4100 where id = 1`);
    await db.execute(
      sql`select refresh_shop_month_figures(array[1], array['2026-07-03T15:00Z'::timestamptz])`,
    );
    await agree();
  });

  it('refuses a turnaround too long for the figures’ seven digits', async () => {
    const error: unknown = await db
      .execute(sql`update jobs set customer_turnaround_minutes = 10000000 where id = 1`)
      .catch((e: unknown) => e);
    expect(String((error as { cause?: unknown }).cause)).toMatch(
      /violates check constraint "jobs_turnaround_range"/,
    );
  });
});
