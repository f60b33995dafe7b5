import { customers, jobs, reels, type NewJob } from '@reelwright/db/schema';
import { quantile } from '@reelwright/metrics';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { jobListQuery, type JobListParams } from '~/lib/validators/jobs';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import type { ApiError } from '../errors';
import { openMinutesPerDay, shopCalendar } from '../bench/calendar';
import { buildNetwork, type Network } from '../bench/fixture';
import type { Principal } from '../principal';
import { listJobs, promiseSuggestion, searchCustomers } from './bench';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Network;
const NOW = new Date('2026-11-20T17:00:00Z');
const DAY = 86_400_000;
const daysAgo = (n: number) => new Date(NOW.getTime() - n * DAY);

beforeAll(async () => {
  await openMemoryDb();
  net = await buildNetwork(state.handle!.db);
  const db = state.handle!.db;
  const [bo, cy] = await db
    .insert(customers)
    .values([
      {
        shopId: net.shops.dune.id,
        name: 'Bo Marrowfield',
        phone: '(207) 555-0177',
        email: 'bo@example.test',
      },
      {
        shopId: net.shops.dune.id,
        name: 'Cy Underbay',
        phone: null,
        email: 'cy.underbay@example.test',
      },
    ])
    .returning();
  const [boReel, cyReel] = await db
    .insert(reels)
    .values([
      { customerId: bo!.id, kind: 'spinning' as const, maker: 'Gullcraft', model: 'Seaspray 4000' },
      { customerId: cy!.id, kind: 'fly' as const, maker: 'Featherline', model: 'Arbor 5/6' },
    ])
    .returning();
  const base = (over: Partial<NewJob>): NewJob => ({
    shopId: net.shops.dune.id,
    customerId: net.customers.ada.id,
    reelId: net.reels.ada.id,
    serviceType: 'tune_up',
    checkedInAt: daysAgo(1),
    stateChangedAt: daysAgo(1),
    ...over,
  });
  // 30 ready jobs for the turnaround sample, and a handful of open ones to filter.
  const ready: NewJob[] = Array.from({ length: 30 }, (_, i) =>
    base({
      state: 'collected',
      checkedInAt: daysAgo(40 + i),
      stateChangedAt: daysAgo(30 + i),
      readyAt: daysAgo(31 + i),
      collectedAt: daysAgo(30 + i),
      technicianId: net.as.tech2.id,
      benchTurnaroundMinutes: 480 * (1 + (i % 6)),
      customerTurnaroundMinutes: 480 * (1 + (i % 6)) + 60,
      serviceType: 'overhaul',
    }),
  );
  await db.insert(jobs).values([
    ...ready,
    base({
      state: 'waiting_parts',
      customerId: bo!.id,
      reelId: boReel!.id,
      checkedInAt: new Date('2026-11-02T15:00:00Z'),
      stateChangedAt: daysAgo(12),
      technicianId: net.as.tech.id,
      serviceType: 'repair',
      promisedAt: daysAgo(3),
    }),
    base({
      state: 'on_bench',
      customerId: cy!.id,
      reelId: cyReel!.id,
      checkedInAt: new Date('2026-11-10T15:00:00Z'),
      stateChangedAt: daysAgo(2),
      technicianId: net.as.tech.id,
    }),
    base({ state: 'checked_in', checkedInAt: daysAgo(0.2), stateChangedAt: daysAgo(0.2) }),
    // An old job at another shop must never show for Dune's people.
    base({
      shopId: net.shops.kelp.id,
      customerId: net.customers.kai.id,
      reelId: net.reels.kai.id,
      state: 'waiting_parts',
      stateChangedAt: daysAgo(50),
    }),
  ]);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

const list = (who: Principal, params: JobListParams = {}) =>
  listJobs(who, jobListQuery.parse(params), { now: NOW });

describe('job list', () => {
  it('technician – sees only their shop, newest check-in first, with the total for paging', async () => {
    const page = await list(net.as.tech);
    expect(page.total).toBe(33);
    expect(page.totalExact).toBe(true);
    expect(page.jobs).toHaveLength(25);
    expect(page.jobs.every((j) => j.shopName === 'Dune Test Shop')).toBe(true);
    const times = page.jobs.map((j) => j.checkedInAt.getTime());
    expect(times).toEqual([...times].sort((a, b) => b - a));
    const second = await list(net.as.tech, { page: '2' });
    expect(second.jobs).toHaveLength(8);
    const ids = new Set([...page.jobs, ...second.jobs].map((j) => j.id));
    expect(ids.size).toBe(33);
  });

  it('counts matching jobs up to a cap, then says "more than" and still pages', async () => {
    const query = jobListQuery.parse({});
    const capped = await listJobs(net.as.tech, query, { now: NOW, countCap: 30 });
    expect(capped).toMatchObject({ total: 30, totalExact: false });
    expect(capped.jobs).toHaveLength(25);
    const next = await listJobs(net.as.tech, jobListQuery.parse({ page: '2' }), {
      now: NOW,
      countCap: 30,
    });
    expect(next.jobs).toHaveLength(8);
    const atCap = await listJobs(net.as.tech, query, { now: NOW, countCap: 33 });
    expect(atCap).toMatchObject({ total: 33, totalExact: true });
  });

  it('technician – filters by state, technician and service', async () => {
    const open = await list(net.as.tech, { state: 'checked_in,on_bench,waiting_parts' });
    expect(open.jobs.map((j) => j.state).sort()).toEqual([
      'checked_in',
      'on_bench',
      'waiting_parts',
    ]);
    const mine = await list(net.as.tech, { technicianId: String(net.as.tech.id) });
    expect(mine.total).toBe(2);
    const repairs = await list(net.as.tech, { service: 'repair' });
    expect(repairs.jobs.map((j) => j.customerName)).toEqual(['Bo Marrowfield']);
  });

  it('technician – filters by check-in dates in the shop’s own zone', async () => {
    const page = await list(net.as.tech, { from: '2026-11-02', to: '2026-11-10' });
    expect(page.jobs.map((j) => j.customerName).sort()).toEqual(['Bo Marrowfield', 'Cy Underbay']);
    const oneDay = await list(net.as.tech, { from: '2026-11-10', to: '2026-11-10' });
    expect(oneDay.jobs.map((j) => j.customerName)).toEqual(['Cy Underbay']);
  });

  it('technician – "waiting longer than N days" uses the time in the current state', async () => {
    const page = await list(net.as.tech, { waitingDays: '10' });
    expect(page.jobs.map((j) => [j.customerName, j.daysInState])).toEqual([['Bo Marrowfield', 12]]);
    expect(page.jobs[0]!.late).toBe(true);
    expect((await list(net.as.tech, { waitingDays: '1' })).total).toBe(2);
  });

  it('technician – searches customer name, phone digits, e-mail, reel maker and model, and job number', async () => {
    const names = async (q: string) =>
      (await list(net.as.tech, { q })).jobs.map((j) => j.customerName);
    expect(await names('marrow')).toEqual(['Bo Marrowfield']);
    expect(await names('5550177')).toEqual(['Bo Marrowfield']);
    expect(await names('cy.underbay@')).toEqual(['Cy Underbay']);
    expect(await names('featherline arbor')).toEqual(['Cy Underbay']);
    expect(await names('Seaspray')).toEqual(['Bo Marrowfield']);
    expect(await names('100%')).toEqual([]);
    const one = (await list(net.as.tech, { state: 'on_bench' })).jobs[0]!;
    expect(await names(`#${one.id}`)).toEqual(['Cy Underbay']);
  });

  it('technician – sorts by customer and by time in state, both ways', async () => {
    const byName = await list(net.as.tech, { sort: 'customer', dir: 'asc', pageSize: '100' });
    const names = byName.jobs.map((j) => j.customerName);
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)));
    const longest = await list(net.as.tech, {
      sort: 'stateChangedAt',
      dir: 'asc',
      state: 'on_bench,waiting_parts',
    });
    expect(longest.jobs.map((j) => j.customerName)).toEqual(['Bo Marrowfield', 'Cy Underbay']);
  });

  it('technician – open jobs carry their age; collected ones do not', async () => {
    const page = await list(net.as.tech, { pageSize: '100' });
    const bo = page.jobs.find((j) => j.customerName === 'Bo Marrowfield')!;
    expect(bo.ageDays).toBe(18);
    expect(page.jobs.filter((j) => j.state === 'collected').every((j) => j.ageDays === null)).toBe(
      true,
    );
  });

  it('regional manager – sees the region, can narrow to a shop; another region’s shop is 404', async () => {
    expect((await list(net.as.north)).total).toBe(34);
    expect((await list(net.as.north, { shopId: String(net.shops.kelp.id) })).total).toBe(1);
    const error = await list(net.as.south, { shopId: String(net.shops.dune.id) }).catch(
      (e: unknown) => e,
    );
    expect((error as ApiError).status).toBe(404);
    expect((await list(net.as.south)).total).toBe(0);
  });

  it('caller – a bad query is refused by the schema with the field named', () => {
    const result = jobListQuery.safeParse({ state: 'finished', pageSize: '7' });
    expect(result.error!.issues.map((i) => i.path.join('.')).sort()).toEqual(['pageSize', 'state']);
    const dates = jobListQuery.safeParse({ from: '2026-11-10', to: '2026-11-01' });
    expect(dates.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['to', 'The end date must not be before the start date'],
    ]);
  });
});

describe('customer search', () => {
  it('technician – finds their shop’s customers by name, phone or e-mail, with reels', async () => {
    const found = await searchCustomers(net.as.tech, '555-0177');
    expect(found.map((c) => c.name)).toEqual(['Bo Marrowfield']);
    expect(found[0]!.reels.map((r) => r.model)).toEqual(['Seaspray 4000']);
    expect((await searchCustomers(net.as.tech, 'kai')).map((c) => c.name)).toEqual([]);
    expect((await searchCustomers(net.as.kelpTech, 'kai')).map((c) => c.name)).toEqual([
      'Kai Kelpcustomer',
    ]);
  });
});

describe('promised date suggestion', () => {
  it('technician – p90 of the last 90 days of bench turnaround, in business days, counted from today', async () => {
    const s = await promiseSuggestion(net.as.tech, net.shops.dune.id, { now: NOW });
    const sample = Array.from({ length: 30 }, (_, i) => 480 * (1 + (i % 6)));
    const days = quantile(sample, 0.9) / openMinutesPerDay(shopCalendar(net.shops.dune));
    expect(s.basis).toBe('recent');
    expect(s.sampleSize).toBe(30);
    expect(s.p90Days).toBeCloseTo(days, 9);
    // 8-hour days; p90 of 1…6 days, five of each, is 6 days: six open days after Friday 20 November,
    // skipping the weekend and Thanksgiving (26 November, closed).
    expect(s.businessDays).toBe(6);
    expect(s.promisedOn).toBe('2026-12-01');
    expect(s.today).toBe('2026-11-20');
  });

  it('technician – with too few ready jobs the suggestion falls back to five business days', async () => {
    const s = await promiseSuggestion(net.as.kelpTech, net.shops.kelp.id, { now: NOW });
    expect(s).toMatchObject({ basis: 'default', businessDays: 5, sampleSize: 0, p90Days: null });
    expect(s.promisedOn).toBe('2026-11-27');
  });

  it('technician – older history is used when the last 90 days are thin', async () => {
    const later = new Date(NOW.getTime() + 80 * DAY);
    const s = await promiseSuggestion(net.as.tech, net.shops.dune.id, { now: later });
    expect(s.basis).toBe('history');
    expect(s.sampleSize).toBe(30);
  });
});
