import { sql } from '@reelwright/db';
import {
  auditRounds,
  auditSamples,
  auditForms,
  comebacks,
  correctiveActions,
  customers,
  jobs,
  networkSettings,
  reels,
  regions,
  shops,
  users,
  type NewJob,
} from '@reelwright/db/schema';
import {
  comebackEstimate,
  compareShops,
  comebackRate,
  followUpTable,
  onTimeShare,
  rateRealisation,
  revenuePerBenchHour,
  turnaroundSummary,
  type ComebackAttribution,
} from '@reelwright/metrics';
import { NextRequest } from 'next/server';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { ApiError } from '../../errors';
import type { Principal } from '../../principal';
import { networkComparison, networkTrends, shopMetrics, shopTrends } from '../network';
import { monthsOf } from './trends';
import { turnaroundHistogram } from './shop';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
vi.mock('~/server/session', () =>
  import('~/server/testing/memory-db').then((m) => m.sessionModule),
);

const APRIL = { from: '2026-04-01', to: '2026-04-30' };
// Every April collection's 90-day window has closed by then.
const AS_OF = new Date('2026-09-01T12:00:00Z');
const H = 3_600_000;
const at = (iso: string) => new Date(iso);
const plus = (d: Date, hours: number) => new Date(d.getTime() + hours * H);

const weekdays = (open: string, close: string) =>
  Object.fromEntries(['mon', 'tue', 'wed', 'thu', 'fri'].map((d) => [d, [{ open, close }]]));

interface Ids {
  north: number;
  south: number;
  a: number;
  b: number;
  c: number;
  d: number;
}
let ids: Ids;
const who: Record<'owner' | 'north' | 'south' | 'tech' | 'lead', Principal> = {} as never;
const db = () => state.handle!.db;

/**
 * Four shops. A (New York): five jobs ready and collected in April with known minutes and money,
 * plus one collected at 00:30 on 1 April New York time (still 31 March in Chicago), and comebacks
 * of every kind. B (New York): three clean jobs, no comebacks. C (Chicago): two jobs with no bench
 * time, and one collected at 23:30 on 31 March Chicago time. D (Chicago): nothing at all.
 */
async function buildNetwork() {
  const [north] = await db().insert(regions).values({ name: 'North', code: 'n' }).returning();
  const [south] = await db().insert(regions).values({ name: 'South', code: 's' }).returning();
  const shop = async (name: string, regionId: number, timeZone: string, rate: number) => {
    const [row] = await db()
      .insert(shops)
      .values({
        regionId,
        name,
        slug: name.toLowerCase().replace(/ /g, '-'),
        timeZone,
        openingHours: { ...weekdays('09:00', '17:00'), sat: [{ open: '09:00', close: '13:00' }] },
        labourRateCents: rate,
        royaltyRateBp: 500,
      })
      .returning();
    return row!.id;
  };
  ids = {
    north: north!.id,
    south: south!.id,
    a: await shop('Alder Quay', north!.id, 'America/New_York', 8000),
    b: await shop('Birch Reach', north!.id, 'America/New_York', 7000),
    c: await shop('Cedar Flats', south!.id, 'America/Chicago', 6000),
    d: await shop('Dune Gap', south!.id, 'America/Chicago', 6000),
  };
  await db().insert(networkSettings).values({ id: 1, networkName: 'Test network' });
  const user = async (
    role: Principal['role'],
    email: string,
    shopId: number | null,
    regionId: number | null,
  ) => {
    const [row] = await db()
      .insert(users)
      .values({ email, name: email, passwordHash: 'x', role, shopId, regionId })
      .returning();
    return row!;
  };
  const principal = (
    u: Awaited<ReturnType<typeof user>>,
    scope: Principal['scope'],
  ): Principal => ({
    id: u.id,
    name: u.name,
    email: u.email,
    role: u.role,
    shopId: u.shopId,
    regionId: u.regionId,
    scope,
  });
  who.owner = principal(await user('owner', 'owner@t.test', null, null), { kind: 'network' });
  who.north = principal(await user('regional_manager', 'north@t.test', null, ids.north), {
    kind: 'region',
    regionId: ids.north,
  });
  who.south = principal(await user('regional_manager', 'south@t.test', null, ids.south), {
    kind: 'region',
    regionId: ids.south,
  });
  const tech = await user('technician', 'tech@t.test', ids.a, null);
  who.tech = principal(tech, { kind: 'shop', shopId: ids.a });
  who.lead = principal(await user('shop_lead', 'lead@t.test', ids.a, null), {
    kind: 'shop',
    shopId: ids.a,
  });

  const reelOf: Record<number, { customerId: number; reelId: number }> = {};
  for (const shopId of [ids.a, ids.b, ids.c, ids.d]) {
    const [c] = await db()
      .insert(customers)
      .values({ shopId, name: `Customer ${shopId}` })
      .returning();
    const [r] = await db()
      .insert(reels)
      .values({ customerId: c!.id, kind: 'spinning', maker: 'Inventedco', model: 'Tern 2500' })
      .returning();
    reelOf[shopId] = { customerId: c!.id, reelId: r!.id };
  }
  const job = async (shopId: number, values: Partial<NewJob>) => {
    const [row] = await db()
      .insert(jobs)
      .values({
        shopId,
        ...reelOf[shopId]!,
        serviceType: 'tune_up',
        state: values.collectedAt ? 'collected' : values.readyAt ? 'ready' : 'on_bench',
        technicianId: tech.id,
        ...values,
      } as NewJob)
      .returning();
    return row!.id;
  };

  // Shop A: customer minutes 60, 120, 180, 240, 600; bench 60, 100, 180, 200, 300.
  const aJobs: number[] = [];
  const spec = [
    { c: 60, b: 60, promised: 1, parts: 1000, discount: 0 },
    { c: 120, b: 100, promised: 1, parts: 1000, discount: 500 },
    { c: 180, b: 180, promised: -1, parts: 0, discount: 0 },
    { c: 240, b: 200, promised: 1, parts: 0, discount: 0 },
    { c: 600, b: 300, promised: null, parts: 0, discount: 0 },
  ];
  for (const [i, s] of spec.entries()) {
    const ready = at(`2026-04-${String(6 + i).padStart(2, '0')}T16:00:00Z`);
    aJobs.push(
      await job(ids.a, {
        checkedInAt: plus(ready, -48),
        readyAt: ready,
        promisedAt: s.promised === null ? null : plus(ready, s.promised),
        collectedAt: plus(ready, 24),
        customerTurnaroundMinutes: s.c,
        benchTurnaroundMinutes: s.b,
        waitingPartsMinutes: s.c - s.b,
        benchMinutes: 60,
        labourCents: 5000,
        partsCents: s.parts,
        discountCents: s.discount,
      }),
    );
  }
  // 1 April 00:30 in New York: inside April for A.
  const boundaryA = await job(ids.a, {
    checkedInAt: at('2026-03-30T14:00:00Z'),
    readyAt: at('2026-03-31T15:00:00Z'),
    collectedAt: at('2026-04-01T04:30:00Z'),
    customerTurnaroundMinutes: 500,
    benchTurnaroundMinutes: 500,
    waitingPartsMinutes: 0,
    benchMinutes: 90,
    labourCents: 7000,
  });
  const comeback = async (
    original: number,
    collected: Date,
    days: number,
    status: 'open' | 'confirmed' | 'dismissed',
    attribution: ComebackAttribution | null,
  ) => {
    const detectedAt = new Date(collected.getTime() + days * 24 * H);
    const back = await job(ids.a, {
      checkedInAt: detectedAt,
      serviceType: 'repair',
      comebackOfJobId: original,
    });
    await db().insert(comebacks).values({
      jobId: back,
      originalJobId: original,
      originalShopId: ids.a,
      status,
      attribution,
      detectedAt,
      daysSinceCollection: days,
      symptom: 'Drag slips again',
    });
  };
  const collectedOf = (i: number) =>
    plus(at(`2026-04-${String(6 + i).padStart(2, '0')}T16:00:00Z`), 24);
  await comeback(aJobs[0]!, collectedOf(0), 20, 'confirmed', 'workmanship');
  await comeback(aJobs[1]!, collectedOf(1), 30, 'confirmed', 'customer_damage');
  await comeback(aJobs[2]!, collectedOf(2), 10, 'dismissed', null);
  await comeback(aJobs[3]!, collectedOf(3), 15, 'open', null);
  // Outside the 90-day window: not a comeback of this job for the rate.
  await comeback(aJobs[4]!, collectedOf(4), 100, 'confirmed', 'part_failure');
  void boundaryA;

  // Shop B: three clean jobs.
  for (const [i, minutes] of [90, 150, 210].entries()) {
    const ready = at(`2026-04-${String(13 + i).padStart(2, '0')}T15:00:00Z`);
    await job(ids.b, {
      checkedInAt: plus(ready, -30),
      readyAt: ready,
      promisedAt: plus(ready, 2),
      collectedAt: plus(ready, 48),
      customerTurnaroundMinutes: minutes,
      benchTurnaroundMinutes: minutes,
      waitingPartsMinutes: 0,
      benchMinutes: 45,
      labourCents: 4000,
    });
  }

  // Shop C: no bench time logged; one collected 31 March 23:30 Chicago time (outside April).
  for (const day of ['2026-04-20', '2026-04-21']) {
    const ready = at(`${day}T15:00:00Z`);
    await job(ids.c, {
      checkedInAt: plus(ready, -20),
      readyAt: ready,
      collectedAt: plus(ready, 2),
      customerTurnaroundMinutes: 300,
      benchTurnaroundMinutes: 300,
      waitingPartsMinutes: 0,
      benchMinutes: null,
      labourCents: 3000,
    });
  }
  await job(ids.c, {
    checkedInAt: at('2026-03-28T15:00:00Z'),
    readyAt: at('2026-03-30T15:00:00Z'),
    collectedAt: at('2026-04-01T04:30:00Z'),
    customerTurnaroundMinutes: 700,
    benchTurnaroundMinutes: 700,
    waitingPartsMinutes: 0,
    benchMinutes: 30,
    labourCents: 3000,
  });
}

beforeAll(async () => {
  await openMemoryDb();
  await buildNetwork();
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

const ctx = () => ({ db: db(), asOf: AS_OF });
const same = (actual: number | null, expected: number | null, label?: string) =>
  expected === null
    ? expect(actual, label).toBeNull()
    : expect(actual, label).toBeCloseTo(expected, 9);
// Raw rows carry instants as text on PGlite and as Date on node-postgres.
const toDate = (v: unknown) => (v == null ? null : new Date(v as string | Date));
const byName = (r: Awaited<ReturnType<typeof networkComparison>>, name: string) =>
  r.shops.find((s) => s.shop.name === name)!;

describe('network comparison – figures worked out by hand', () => {
  it('owner – a shop with comebacks of every kind: counts, quantiles, money', async () => {
    const r = await networkComparison(who.owner, APRIL, ctx());
    const a = byName(r, 'Alder Quay');
    expect(a.jobsReady).toBe(5);
    // Type 7: median is the middle value; p90 at h = 3.6 is 240 + 0.6 × (600 − 240).
    expect(a.customerTurnaround).toEqual({ count: 5, totalMinutes: 1200, median: 180, p90: 456 });
    expect(a.benchTurnaround.median).toBe(180);
    expect(a.benchTurnaround.p90).toBeCloseTo(260, 9);
    expect(a.waitingPartsMinutes).toBe(360);
    expect(a.onTime).toEqual({ onTime: 3, total: 4, share: 0.75 });
    // Six collected in April (the 00:30 one included); the workmanship one is the only event,
    // the customer-damage one a trial; dismissed, open and late returns are not comebacks.
    expect(a.comebacks).toMatchObject({
      collected: 6,
      trials: 6,
      events: 1,
      censored: 0,
      awaitingReview: 1,
    });
    expect(a.comebacks.rate).toBeCloseTo(1 / 6, 12);
    // 5 × 50.00 labour + 20.00 parts − 5.00 discount over 5 bench hours.
    expect(a.revenue).toMatchObject({
      revenueCents: 26_500,
      labourCents: 25_000,
      benchMinutes: 300,
    });
    expect(a.revenue.perBenchHourCents).toBe(5_300);
    expect(a.revenue.labourPerBenchHourCents).toBe(5_000);
    expect(a.revenue.realisation).toBe(0.625);
    expect(a.audits).toMatchObject({ rounds: 0, trials: 0, band: null });
    expect(a.correctiveActions).toEqual({ open: 0, overdue: 0 });
    // Mon–Fri 8 h and Saturday 4 h: 44 h over 6 open days.
    expect(a.shop.openMinutesPerDay).toBe(440);
  });

  it('owner – a shop with no comebacks and a shop with no bench time', async () => {
    const r = await networkComparison(who.owner, APRIL, ctx());
    const b = byName(r, 'Birch Reach');
    expect(b.comebacks).toMatchObject({ events: 0, trials: 3, rate: 0 });
    expect(b.comebacks.interval).toMatchObject({ lower: 0 });
    expect(b.customerTurnaround).toMatchObject({ median: 150, p90: 198 });
    expect(b.revenue.perBenchHourCents).toBeCloseTo((12_000 * 60) / 135, 9);

    const c = byName(r, 'Cedar Flats');
    expect(c.jobsReady).toBe(2);
    expect(c.revenue).toMatchObject({
      revenueCents: 6_000,
      benchMinutes: 0,
      perBenchHourCents: null,
      labourPerBenchHourCents: null,
      realisation: null,
    });
    // 31 March 23:30 in Chicago is not April there.
    expect(c.comebacks).toMatchObject({ collected: 2, trials: 2, events: 0 });

    const d = byName(r, 'Dune Gap');
    expect(d.jobsReady).toBe(0);
    expect(d.customerTurnaround).toEqual({ count: 0, totalMinutes: 0, median: null, p90: null });
    expect(d.onTime.share).toBeNull();
    expect(d.comebacks).toMatchObject({
      trials: 0,
      rate: null,
      interval: null,
      band: null,
      side: null,
    });

    // The network rate pools every shop: 1 event in 6 + 3 + 2 trials.
    expect(r.network.comebacks).toMatchObject({ events: 1, trials: 11, collected: 11 });
    expect(r.network.comebacks.rate).toBeCloseTo(1 / 11, 12);
    expect(r.network.jobsReady).toBe(10);
  });

  it('owner – an empty period gives zeros, no rates and no bands', async () => {
    const r = await networkComparison(who.owner, { from: '2020-01-01', to: '2020-01-31' }, ctx());
    expect(r.shops).toHaveLength(4);
    expect(r.network.comebacks).toMatchObject({
      events: 0,
      trials: 0,
      collected: 0,
      censored: 0,
      rate: null,
      comparison: 'binomial',
      estimate: { probability: null, jobs: 0 },
    });
    expect(r.network.revenue.perBenchHourCents).toBeNull();
    for (const s of r.shops) {
      expect(s.jobsReady).toBe(0);
      expect(s.comebacks.band).toBeNull();
      expect(s.customerTurnaround.median).toBeNull();
      expect(s.revenue.perBenchHourCents).toBeNull();
    }
  });

  it('owner – jobs still inside their warranty window are followed, not left out', async () => {
    const r = await networkComparison(who.owner, APRIL, {
      db: db(),
      asOf: at('2026-06-15T12:00:00Z'),
    });
    const a = byName(r, 'Alder Quay');
    // One counted return (workmanship, day 20); the open one awaits review. The other five jobs
    // are still inside their window: followed, estimated, and said so.
    expect(a.comebacks).toMatchObject({
      collected: 6,
      censored: 4,
      comparison: 'ratio',
      events: 1,
      trials: 6,
      estimate: { jobs: 6, events: 1, stillFollowed: 5, final: false },
    });
    // No job before April to build a network curve from: an estimate, but no band.
    expect(r.reference).toBeNull();
    expect(a.comebacks.band).toBeNull();
  });

  it('owner – audit samples and open corrective actions are counted once rows exist', async () => {
    const [form] = await db().insert(auditForms).values({ version: 1, title: 'Form' }).returning();
    const decidedRound = (periodStart: string, periodEnd: string) => ({
      shopId: ids.b,
      formId: form!.id,
      periodStart,
      periodEnd,
      status: 'decided' as const,
      severity: 'normal' as const,
      aql: 2.5,
      lotSize: 3,
      codeLetter: 'A',
      sampleSize: 2,
      acceptNumber: 0,
      rejectNumber: 1,
      decision: 'rejected' as const,
      failures: 1,
      seed: 'x',
      lotJobIds: [],
      plannedById: who.owner.id,
    });
    // A rejected round in March (outside the period) and one in April: two rejections within
    // five rounds put the next round on tightened inspection (ISO 2859-1 §9.3.1).
    await db().insert(auditRounds).values(decidedRound('2026-03-01', '2026-03-31'));
    const [round] = await db()
      .insert(auditRounds)
      .values(decidedRound('2026-04-01', '2026-04-30'))
      .returning();
    const bJobs = await db().execute<{ id: number }>(
      sql`select id from jobs where shop_id = ${ids.b} order by id`,
    );
    await db()
      .insert(auditSamples)
      .values([
        {
          roundId: round!.id,
          jobId: bJobs.rows[0]!.id,
          position: 1,
          score: 92,
          verdict: 'meets_standard',
        },
        {
          roundId: round!.id,
          jobId: bJobs.rows[1]!.id,
          position: 2,
          score: 40,
          verdict: 'critical_miss',
        },
      ]);
    await db()
      .insert(correctiveActions)
      .values([
        {
          shopId: ids.b,
          source: 'audit',
          auditRoundId: round!.id,
          title: 'Retrain',
          dueOn: '2026-05-01',
        },
        { shopId: ids.b, source: 'audit', title: 'Check torque', dueOn: '2027-01-01' },
        { shopId: ids.b, source: 'other', title: 'Done', dueOn: '2026-05-01', status: 'verified' },
      ]);
    try {
      const r = await networkComparison(who.owner, APRIL, ctx());
      const b = byName(r, 'Birch Reach');
      expect(b.audits).toMatchObject({
        rounds: 1,
        trials: 2,
        events: 1,
        criticalMisses: 1,
        rate: 0.5,
        // (92 + 40) / 2
        averageScore: 66,
        roundsAccepted: 0,
        roundsRejected: 1,
        severity: 'tightened',
      });
      expect(byName(r, 'Alder Quay').audits).toMatchObject({
        averageScore: null,
        roundsRejected: 0,
        severity: 'normal',
      });
      expect(b.audits.band).not.toBeNull();
      expect(b.correctiveActions).toEqual({ open: 2, overdue: 1 });
      expect(r.network.audits).toMatchObject({ events: 1, trials: 2, rounds: 1, rate: 0.5 });
      expect(byName(r, 'Alder Quay').audits.band).toBeNull();
    } finally {
      await db().delete(correctiveActions);
      await db().delete(auditSamples);
      await db().delete(auditRounds);
      await db().delete(auditForms);
    }
  });
});

describe('network comparison – the API equals the metrics engine on the same rows', () => {
  // Whole months (read from the monthly figures), days on either side of whole months and a
  // period inside one month (read from the jobs), and an as-of date that leaves some warranty
  // windows open (those collections counted from the jobs).
  it.each([
    ['April', APRIL, AS_OF],
    ['17 March – 9 May', { from: '2026-03-17', to: '2026-05-09' }, AS_OF],
    ['6 – 23 April', { from: '2026-04-06', to: '2026-04-23' }, AS_OF],
    [
      'March – May, as of 15 July',
      { from: '2026-03-01', to: '2026-05-31' },
      at('2026-07-15T12:00:00Z'),
    ],
  ])(
    'owner – every shop figure is what @reelwright/metrics makes of the raw rows: %s',
    async (_, period, asOf) => {
      const r = await networkComparison(who.owner, period, { db: db(), asOf });
      expect(r.network.jobsReady).toBeGreaterThan(0);
      const after = new Date(Date.parse(`${period.to}T00:00:00Z`) + 86_400_000)
        .toISOString()
        .slice(0, 10);
      const ready = await db().execute<Record<string, unknown>>(sql`
      select j.shop_id, s.labour_rate_cents, j.customer_turnaround_minutes, j.bench_turnaround_minutes,
        j.ready_at, j.promised_at, j.labour_cents, j.parts_cents, j.discount_cents, j.bench_minutes
      from jobs j join shops s on s.id = j.shop_id
      where j.ready_at >= (${period.from}::timestamp at time zone s.time_zone)
        and j.ready_at < (${after}::timestamp at time zone s.time_zone)`);
      const collected = await db().execute<Record<string, unknown>>(sql`
      select j.id, j.shop_id, j.collected_at from jobs j join shops s on s.id = j.shop_id
      where j.collected_at >= (${period.from}::timestamp at time zone s.time_zone)
        and j.collected_at < (${after}::timestamp at time zone s.time_zone)`);
      const backs = await db().execute<Record<string, unknown>>(sql`
      select original_job_id, attribution::text as attribution, detected_at from comebacks
      where status = 'confirmed' and attribution is not null`);
      const counts = r.shops.map((s) => {
        const rows = ready.rows.filter((x) => Number(x.shop_id) === s.shop.id);
        const num = (x: unknown) => Number(x ?? 0);
        const customer = turnaroundSummary(rows.map((x) => num(x.customer_turnaround_minutes)));
        const bench = turnaroundSummary(rows.map((x) => num(x.bench_turnaround_minutes)));
        expect(s.customerTurnaround.count, s.shop.name).toBe(customer.count);
        same(s.customerTurnaround.median, customer.median, s.shop.name);
        same(s.customerTurnaround.p90, customer.p90, s.shop.name);
        same(s.benchTurnaround.median, bench.median);
        same(s.benchTurnaround.p90, bench.p90);
        expect(s.onTime).toEqual(
          onTimeShare(
            rows.map((x) => ({ readyAt: toDate(x.ready_at), promisedAt: toDate(x.promised_at) })),
          ),
        );
        const money = rows.map((x) => ({
          revenueCents: num(x.labour_cents) + num(x.parts_cents) - num(x.discount_cents),
          labourCents: num(x.labour_cents),
          benchMinutes: num(x.bench_minutes),
        }));
        expect(s.revenue.perBenchHourCents).toEqual(revenuePerBenchHour(money));
        const realisation = rateRealisation(money, s.shop.labourRateCents);
        expect(s.revenue.labourPerBenchHourCents).toEqual(realisation.labourPerBenchHour);
        expect(s.revenue.realisation).toEqual(realisation.realisation);
        const rate = comebackRate(
          collected.rows
            .filter((x) => Number(x.shop_id) === s.shop.id)
            .map((x) => ({
              collectedAt: toDate(x.collected_at),
              comebacks: backs.rows
                .filter((b) => Number(b.original_job_id) === Number(x.id))
                .map((b) => ({
                  attribution: b.attribution as ComebackAttribution,
                  reportedAt: toDate(b.detected_at)!,
                })),
            })),
          { asOf, warrantyDays: 90 },
        );
        if (s.comebacks.comparison === 'ratio') {
          // Windows open: the estimate from each job's follow-up, as the engine makes it.
          const rows = collected.rows
            .filter((x) => Number(x.shop_id) === s.shop.id)
            .map((x) => {
              const times = backs.rows
                .filter(
                  (b) =>
                    Number(b.original_job_id) === Number(x.id) &&
                    ['workmanship', 'part_failure'].includes(String(b.attribution)),
                )
                .map((b) => toDate(b.detected_at)!.getTime());
              return {
                collectedAt: toDate(x.collected_at)!,
                comebackAt: times.length ? new Date(Math.min(...times)) : null,
              };
            });
          const e = comebackEstimate(followUpTable(rows, { asOf, warrantyDays: 90 }), {
            warrantyDays: 90,
          });
          expect(s.comebacks.estimate.probability, s.shop.name).toEqual(e.probability);
          expect(s.comebacks.interval).toEqual(e.interval);
          expect(s.comebacks.events).toBe(rate.events);
          return null;
        }
        expect({ events: s.comebacks.events, trials: s.comebacks.trials }).toEqual({
          events: rate.events,
          trials: rate.trials,
        });
        expect(s.comebacks.interval).toEqual(rate.interval);
        return { shopId: String(s.shop.id), events: rate.events, trials: rate.trials };
      });
      if (counts.includes(null)) return;
      const engine = compareShops(counts as NonNullable<(typeof counts)[number]>[]);
      expect(r.network.comebacks.rate).toBe(engine.networkRate);
      for (const [i, s] of r.shops.entries()) {
        const e = engine.shops[i]!;
        expect(s.comebacks.funnel95).toEqual(e.funnel95);
        expect(s.comebacks.funnel998).toEqual(e.funnel998);
        expect(s.comebacks.band).toBe(e.trials === 0 ? null : e.band);
      }
    },
  );

  it('owner – the shop page histogram and monthly trends agree with the comparison', async () => {
    const m = await shopMetrics(who.owner, ids.a, APRIL, ctx());
    const bins = m.histogram.bins;
    expect(bins.reduce((n, b) => n + b.customer, 0)).toBe(5);
    expect(bins.reduce((n, b) => n + b.bench, 0)).toBe(5);
    expect(m.figures.customerTurnaround.median).toBe(180);
    expect(m.comebacks.map((c) => [c.status, c.attribution, c.counted]).sort()).toEqual(
      [
        ['confirmed', 'customer_damage', false],
        ['confirmed', 'part_failure', false],
        ['confirmed', 'workmanship', true],
        ['dismissed', null, false],
        ['open', null, false],
      ].sort(),
    );
    expect(m.byServiceType).toEqual([
      expect.objectContaining({
        key: 'tune_up',
        label: 'Tune-up',
        jobs: 5,
        perBenchHourCents: 5_300,
      }),
    ]);
    expect(m.byTechnician).toEqual([
      expect.objectContaining({ label: 'tech@t.test', jobs: 5, revenueCents: 26_500 }),
    ]);
    // The five return jobs are still open; the oldest first.
    expect(m.openLongest.map((j) => j.state)).toEqual(Array(5).fill('on_bench'));
    expect(m.openCounts.on_bench).toBe(5);

    const t = await shopTrends(
      who.owner,
      ids.a,
      { from: '2026-03-01', to: '2026-05-31', metric: 'comebacks' },
      ctx(),
    );
    expect(t.months).toEqual(['2026-03', '2026-04', '2026-05']);
    if (t.metric !== 'comebacks') throw new Error('wrong metric');
    const april = t.shops[0]!.points[1]!;
    expect(april).toMatchObject({ label: '2026-04', events: 1, trials: 6 });
    expect(t.shops[0]!.center).toBeCloseTo(1 / 6, 12);
    const turnaround = await networkTrends(who.owner, { ...APRIL, metric: 'turnaround' }, ctx());
    if (turnaround.metric !== 'turnaround') throw new Error('wrong metric');
    const alder = turnaround.shops.find((s) => s.shop.id === ids.a)!;
    expect(alder.points).toEqual([
      {
        label: '2026-04',
        count: 5,
        customerMedian: 180,
        customerP90: 456,
        benchMedian: 180,
        benchP90: expect.closeTo(260, 9),
      },
    ]);
  });
});

describe('network comparison – scope', () => {
  it("regional manager – sees only their region's shops but is judged against the whole network", async () => {
    const north = await networkComparison(who.north, APRIL, ctx());
    expect(north.shops.map((s) => s.shop.name)).toEqual(['Alder Quay', 'Birch Reach']);
    expect(north.regions).toEqual([{ id: ids.north, name: 'North' }]);
    expect(north.network.comebacks.trials).toBe(11);
    expect(north.view.comebacks.trials).toBe(9);
    await expect(
      networkComparison(who.north, { ...APRIL, region: ids.south }, ctx()),
    ).rejects.toMatchObject({
      status: 404,
    });
    await expect(shopMetrics(who.north, ids.c, APRIL, ctx())).rejects.toBeInstanceOf(ApiError);
    await expect(
      shopTrends(who.north, ids.c, { ...APRIL, metric: 'revenue' }, ctx()),
    ).rejects.toMatchObject({
      status: 404,
    });
  });

  it('owner – the region filter narrows the shops shown, not the network', async () => {
    const south = await networkComparison(who.owner, { ...APRIL, region: ids.south }, ctx());
    expect(south.region).toEqual({ id: ids.south, name: 'South' });
    expect(south.shops.map((s) => s.shop.name)).toEqual(['Cedar Flats', 'Dune Gap']);
    expect(south.network.shops).toBe(4);
    await expect(
      networkComparison(who.owner, { ...APRIL, region: 9999 }, ctx()),
    ).rejects.toMatchObject({
      status: 404,
    });
  });

  it("shop lead – reads their own shop's page and not another's", async () => {
    const m = await shopMetrics(who.lead, ids.a, APRIL, ctx());
    expect(m.figures.shop.name).toBe('Alder Quay');
    await expect(shopMetrics(who.lead, ids.b, APRIL, ctx())).rejects.toMatchObject({ status: 404 });
  });
});

describe('network routes', () => {
  async function get(principal: Principal, path: string, params: Record<string, string> = {}) {
    state.principal = principal;
    const url = `http://localhost${path}`;
    const handler = path.startsWith('/api/network/comparison')
      ? (await import('~/app/api/network/comparison/route')).GET
      : path.startsWith('/api/network/trends')
        ? (await import('~/app/api/network/trends/route')).GET
        : path.includes('/metrics')
          ? (await import('~/app/api/shops/[id]/metrics/route')).GET
          : (await import('~/app/api/shops/[id]/trends/route')).GET;
    const response = await handler(new NextRequest(url), { params: Promise.resolve(params) });
    return {
      status: response.status,
      type: response.headers.get('content-type'),
      body: await response.json(),
    };
  }

  it('technician – gets 403 from the network routes, and their own shop page reads', async () => {
    const r = await get(who.tech, '/api/network/comparison?from=2026-04-01&to=2026-04-30');
    expect(r).toMatchObject({ status: 403, type: 'application/problem+json' });
    expect(
      (await get(who.tech, '/api/network/trends?from=2026-04-01&to=2026-04-30&metric=comebacks'))
        .status,
    ).toBe(403);
    const own = await get(who.tech, `/api/shops/${ids.a}/metrics?from=2026-04-01&to=2026-04-30`, {
      id: String(ids.a),
    });
    expect(own.status).toBe(200);
    expect(own.body.figures.shop.name).toBe('Alder Quay');
  });

  it('regional manager – bad dates are 400 with field errors; another region is 404', async () => {
    const bad = await get(who.north, '/api/network/comparison?from=2026-02-30&to=soon');
    expect(bad.status).toBe(400);
    expect(bad.body.errors).toEqual([
      { field: 'query.from', message: 'Not a calendar date' },
      { field: 'query.to', message: 'Give a date as YYYY-MM-DD' },
    ]);
    const long = await get(who.north, '/api/network/comparison?from=2020-01-01&to=2026-01-01');
    expect(long.body.errors).toEqual([
      { field: 'query.to', message: 'A period can span at most five years' },
    ]);
    const metric = await get(
      who.north,
      `/api/shops/${ids.a}/trends?from=2026-04-01&to=2026-04-30&metric=speed`,
      {
        id: String(ids.a),
      },
    );
    expect(metric.body.errors).toEqual([
      { field: 'query.metric', message: 'Metric is comebacks, turnaround or revenue' },
    ]);
    const other = await get(
      who.north,
      `/api/shops/${ids.c}/metrics?from=2026-04-01&to=2026-04-30`,
      {
        id: String(ids.c),
      },
    );
    expect(other).toMatchObject({ status: 404, type: 'application/problem+json' });
  });
});

describe('helpers', () => {
  it('months of a period, across a year end', () => {
    expect(monthsOf({ from: '2025-11-15', to: '2026-02-01' })).toEqual([
      '2025-11',
      '2025-12',
      '2026-01',
      '2026-02',
    ]);
  });

  it('histogram: round bin widths, an open last bin, every job counted once', () => {
    const customer = [...Array(95).fill(100), 200, 300, 400, 5000, 9000];
    const h = turnaroundHistogram(customer, customer);
    expect(h.binMinutes).toBe(30);
    expect(h.bins.at(-1)).toMatchObject({ from: 120, to: null, customer: 5 });
    expect(h.bins.reduce((n, b) => n + b.customer, 0)).toBe(100);
    expect(turnaroundHistogram([], [])).toEqual({ binMinutes: 60, bins: [] });
  });
});
