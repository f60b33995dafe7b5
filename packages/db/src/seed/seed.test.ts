import { verify } from '@node-rs/argon2';
import { fairnessBand } from '@reelwright/metrics';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runMigrations, type Db, type DbHandle } from '../client';
import { freshDb, TARGET } from '../test/databases';
import {
  DEFAULT_SEED_NOW,
  DEMO_ACCOUNTS,
  DEMO_PASSWORD,
  isEmpty,
  SEEDED_TABLES,
  seedDemo,
  seedDigest,
} from './index';

async function rows<T extends Record<string, unknown>>(db: Db, query: ReturnType<typeof sql>) {
  return (await db.execute<T>(query)).rows;
}

describe(`demo seed determinism (${TARGET})`, () => {
  // A quarter of a year keeps these quick; the full network is checked below.
  const small = { years: 0.25, passwordHash: 'not-a-hash' };

  async function digestOf(db: Db, seed: string): Promise<string> {
    await db.execute(
      sql`truncate table ${sql.join([...SEEDED_TABLES], sql`, `)} restart identity cascade`,
    );
    await seedDemo(db, { ...small, seed });
    return seedDigest(db);
  }

  it('gives the same rows for the same seed and different rows for another', async () => {
    const handle = await freshDb();
    try {
      await runMigrations(handle);
      const first = await digestOf(handle.db, 'fixed');
      expect(first).toMatch(/^[0-9a-f]{64}$/);
      expect(await digestOf(handle.db, 'fixed')).toBe(first);
      expect(await digestOf(handle.db, 'another')).not.toBe(first);
    } finally {
      await handle.close();
    }
  });

  it.runIf(TARGET === 'pg')('gives the same digest on PostgreSQL as on PGlite', async () => {
    const [onPg, onPglite] = await Promise.all([freshDb('pg'), freshDb('pglite')]);
    try {
      await Promise.all([runMigrations(onPg), runMigrations(onPglite)]);
      expect(await digestOf(onPg.db, 'fixed')).toBe(await digestOf(onPglite.db, 'fixed'));
    } finally {
      await Promise.all([onPg.close(), onPglite.close()]);
    }
  });
});

describe(`the demo network (${TARGET})`, () => {
  let handle: DbHandle;
  let db: Db;

  beforeAll(async () => {
    handle = await freshDb();
    await runMigrations(handle);
    expect(await isEmpty(handle.db)).toBe(true);
    await seedDemo(handle.db);
    db = handle.db;
  });
  afterAll(() => handle?.close());

  // Seeding speed is printed by the seed CLI; tests do not time it.
  it('is seeded only into an empty database', async () => {
    expect(await isEmpty(db)).toBe(false);
    await expect(seedDemo(db)).rejects.toThrow(/only fills an empty one/);
  });

  it('leaves planner statistics and a set visibility map, so index-only scans skip the heap', async () => {
    const tables = await rows<{
      name: string;
      live: number;
      estimate: number;
      pages: number;
      visible: number;
    }>(
      db,
      sql`select c.relname as name, c.reltuples::float as estimate, c.relpages as pages,
          c.relallvisible as visible, (select count(*)::int from jobs) as live
        from pg_class c where c.relname = 'jobs'`,
    );
    const jobs = tables[0]!;
    expect(jobs.pages).toBeGreaterThan(0);
    expect(jobs.visible).toBe(jobs.pages);
    expect(Math.abs(jobs.estimate - jobs.live)).toBeLessThan(jobs.live * 0.01);
  });

  it('has two regions, seven shops and at least 25,000 jobs over two years', async () => {
    const [counts] = await rows<{
      regions: number;
      shops: number;
      jobs: number;
      first: string;
      last: string;
    }>(
      db,
      sql`select (select count(*)::int from regions) as regions, (select count(*)::int from shops) as shops,
        (select count(*)::int from jobs) as jobs,
        (select min(checked_in_at)::text from jobs) as first, (select max(checked_in_at)::text from jobs) as last`,
    );
    expect(counts).toMatchObject({ regions: 2, shops: 7 });
    expect(counts!.jobs).toBeGreaterThanOrEqual(25_000);
    expect(new Date(counts!.last).getTime()).toBeLessThanOrEqual(DEFAULT_SEED_NOW.getTime());
    expect(DEFAULT_SEED_NOW.getTime() - new Date(counts!.first).getTime()).toBeGreaterThan(
      725 * 86_400_000,
    );
  });

  it('has the eight demo accounts with their roles and scopes, signing in with the demo password', async () => {
    const users = await rows<{
      email: string;
      role: string;
      shop: string | null;
      region: string | null;
      hash: string;
      is_demo: boolean;
    }>(
      db,
      sql`select u.email, u.role::text as role, s.slug as shop, r.code as region, u.password_hash as hash, u.is_demo
        from users u left join shops s on s.id = u.shop_id left join regions r on r.id = u.region_id`,
    );
    expect(users.length).toBeGreaterThanOrEqual(20);
    for (const account of DEMO_ACCOUNTS) {
      const user = users.find((u) => u.email === account.email);
      expect(user, account.email).toBeDefined();
      expect(user!.role).toBe(account.role);
      expect(user!.shop ?? user!.region).toBe(account.scope);
      expect(user!.is_demo).toBe(true);
    }
    expect(new Set(users.map((u) => u.role))).toEqual(
      new Set(['owner', 'regional_manager', 'shop_lead', 'technician', 'auditor']),
    );
    const owner = users.find((u) => u.email === 'owner@saltwick.test')!;
    expect(owner.hash).toMatch(/^\$argon2id\$/);
    expect(await verify(owner.hash, DEMO_PASSWORD)).toBe(true);
  });

  it('has open jobs in every state, and old jobs collected (bar a few never picked up)', async () => {
    const states = await rows<{ state: string; n: number; oldest: string }>(
      db,
      sql`select state::text as state, count(*)::int as n, min(checked_in_at)::text as oldest from jobs group by state`,
    );
    expect(states.map((s) => s.state).sort()).toEqual([
      'checked_in',
      'collected',
      'on_bench',
      'ready',
      'waiting_parts',
    ]);
    const [old] = await rows<{ share: number; unfinished: number }>(
      db,
      sql`select avg((state <> 'collected')::int)::float as share,
          count(*) filter (where state not in ('ready', 'collected'))::int as unfinished
        from jobs where checked_in_at < ${DEFAULT_SEED_NOW.toISOString()}::timestamptz - interval '120 days'`,
    );
    expect(old!.share).toBeLessThan(0.01);
    expect(old!.unfinished).toBe(0);
  });

  it('peaks in the pre-season rush', async () => {
    const [season] = await rows<{ spring: number; winter: number }>(
      db,
      sql`select count(*) filter (where extract(month from checked_in_at) in (3, 4))::int as spring,
        count(*) filter (where extract(month from checked_in_at) in (12, 1))::int as winter from jobs`,
    );
    expect(season!.spring).toBeGreaterThan(2 * season!.winter);
  });

  it('keeps every timeline, figure and checklist consistent with the job', async () => {
    const [check] = await rows<{
      bad_ready: number;
      no_events: number;
      bad_wait: number;
      no_ticks: number;
      waits: number;
    }>(
      db,
      sql`select
        (select count(*)::int from jobs where state in ('ready', 'collected') and (customer_turnaround_minutes is null
          or bench_turnaround_minutes + waiting_parts_minutes <> customer_turnaround_minutes)) as bad_ready,
        (select count(*)::int from jobs j where not exists (select 1 from job_events e where e.job_id = j.id and e.to_state = j.state)) as no_events,
        (select count(*)::int from jobs j where waiting_parts_minutes > 0 and not exists
          (select 1 from job_events e where e.job_id = j.id and e.to_state = 'waiting_parts')) as bad_wait,
        (select count(*)::int from jobs j where state = 'collected' and not exists (select 1 from checklist_ticks t where t.job_id = j.id)) as no_ticks,
        (select count(*)::int from job_events where to_state = 'waiting_parts') as waits`,
    );
    expect(check).toMatchObject({ bad_ready: 0, no_events: 0, bad_wait: 0, no_ticks: 0 });
    expect(check!.waits).toBeGreaterThan(1000);
  });

  describe('tells its story', () => {
    interface ShopRate {
      name: string;
      trials: number;
      events: number;
    }
    // Twelve months whose warranty windows have all closed by the seed's "today".
    async function comebackRates(from: string, to: string): Promise<ShopRate[]> {
      return rows<{ name: string; trials: number; events: number }>(
        db,
        sql`select s.name, count(distinct j.id)::int as trials, count(distinct c.original_job_id)::int as events
          from jobs j join shops s on s.id = j.shop_id
          left join comebacks c on c.original_job_id = j.id and c.status = 'confirmed'
            and c.attribution in ('workmanship', 'part_failure')
          where j.comeback_of_job_id is null and j.collected_at >= ${from}::timestamptz and j.collected_at < ${to}::timestamptz
            and (j.collected_at <= ${DEFAULT_SEED_NOW.toISOString()}::timestamptz - interval '90 days' or c.id is not null)
          group by s.name`,
      );
    }

    it('Brackwater Flats has a comeback rate truly out of line, and skips drag-stack steps', async () => {
      const shops = await comebackRates('2025-09-01', '2026-09-01');
      const trials = shops.reduce((n, s) => n + s.trials, 0);
      const network = shops.reduce((n, s) => n + s.events, 0) / trials;
      const brackwater = shops.find((s) => s.name === 'Brackwater Flats')!;
      expect(brackwater.trials).toBeGreaterThan(1000);
      expect(brackwater.events / brackwater.trials).toBeGreaterThan(1.8 * network);
      expect(fairnessBand(brackwater.events, brackwater.trials, network)).toBe('out of line');

      const skips = await rows<{ name: string; skipped: number }>(
        db,
        sql`select s.name, avg((not exists (select 1 from checklist_ticks t join service_standard_steps st on st.id = t.step_id
            where t.job_id = j.id and st.code = 'drag.washers'))::int)::float as skipped
          from jobs j join shops s on s.id = j.shop_id where j.state = 'collected' group by s.name`,
      );
      for (const s of skips) {
        if (s.name === 'Brackwater Flats') expect(s.skipped).toBeGreaterThan(0.3);
        else expect(s.skipped).toBeLessThan(0.06);
      }
      const [drag] = await rows<{ share: number }>(
        db,
        sql`select avg((rc.code = 'drag_stack_not_serviced')::int)::float as share from comebacks c
          join shops s on s.id = c.original_shop_id join root_causes rc on rc.id = c.root_cause_id
          where s.slug = 'brackwater-flats' and c.attribution = 'workmanship'`,
      );
      expect(drag!.share).toBeGreaterThan(0.5);
    });

    it('Ternhollow Lake is the smallest shop, its raw comeback rate the worst, yet within the limits', async () => {
      const [small] = await rows<{ name: string; n: number }>(
        db,
        sql`select s.name, count(*)::int as n from jobs j join shops s on s.id = j.shop_id group by s.name order by n limit 1`,
      );
      expect(small!.name).toBe('Ternhollow Lake');
      expect(small!.n).toBeGreaterThanOrEqual(150);
      expect(small!.n).toBeLessThanOrEqual(250);

      const shops = await comebackRates('2025-09-01', '2026-09-01');
      const network =
        shops.reduce((n, s) => n + s.events, 0) / shops.reduce((n, s) => n + s.trials, 0);
      const byRate = [...shops].sort((a, b) => b.events / b.trials - a.events / a.trials);
      expect(byRate[0]!.name).toBe('Ternhollow Lake');
      expect(fairnessBand(byRate[0]!.events, byRate[0]!.trials, network)).not.toBe('out of line');
    });

    it('Skerry Wharf is slow because parts sit waiting', async () => {
      const shops = await rows<{ name: string; waiting: number; bench: number; on_time: number }>(
        db,
        sql`select s.name, avg(j.waiting_parts_minutes)::float as waiting, avg(j.bench_turnaround_minutes)::float as bench,
            avg((j.ready_at <= j.promised_at)::int)::float as on_time
          from jobs j join shops s on s.id = j.shop_id where j.ready_at is not null group by s.name order by waiting desc`,
      );
      const [skerry, next] = shops;
      expect(skerry!.name).toBe('Skerry Wharf');
      expect(skerry!.waiting).toBeGreaterThan(3 * next!.waiting);
      // The bench work itself is ordinary: the waiting is what makes it slow.
      expect(skerry!.bench).toBeLessThan(1.5 * Math.max(...shops.slice(1).map((s) => s.bench)));
      expect(skerry!.on_time).toBeLessThan(
        Math.min(
          ...shops
            .filter((s) => s.name !== 'Ternhollow Lake')
            .slice(1)
            .map((s) => s.on_time),
        ),
      );
    });
  });
});
