import { sql } from '@reelwright/db';
import type { DbHandle } from '@reelwright/db/client';
import { migrate } from '@reelwright/db/client';
import {
  comebacks,
  customers,
  jobs,
  networkSettings,
  reels,
  regions,
  shops,
  type NewJob,
} from '@reelwright/db/schema';
import { freshDb, TARGET } from '@reelwright/db/test-databases';
import {
  comebackEstimate,
  comebackReference,
  compareRatios,
  followUpTable,
  type FollowUpRow,
} from '@reelwright/metrics';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Principal } from '../../principal';
import { networkComparison, networkTrends, shopMetrics } from '../network';
import { followUpTables } from './follow-up';
import { monthsBefore, referencePeriod } from './reference';

// Three shops in two zones. The reference year (June and September 2025) has jobs followed through
// their 90-day windows; April 2026 has jobs whose windows are still open at the as-of instants
// used. Alder Quay's April jobs come back far more often than the reference predicts; Cedar Flats
// has a single April job, which came back.
const DAY = 86_400_000;
const W = 90;
let handle: DbHandle;
const db = () => handle.db;
const owner: Principal = {
  id: 1,
  name: 'Owner',
  email: 'owner@t.test',
  role: 'owner',
  shopId: null,
  regionId: null,
  scope: { kind: 'network' },
};
const ids: Record<'a' | 'b' | 'c', number> = { a: 0, b: 0, c: 0 };

async function build() {
  const [region] = await db().insert(regions).values({ name: 'Coast', code: 'c' }).returning();
  const shop = async (name: string, timeZone: string) => {
    const [row] = await db()
      .insert(shops)
      .values({
        regionId: region!.id,
        name,
        slug: name.toLowerCase().replace(/ /g, '-'),
        timeZone,
        openingHours: { mon: [{ open: '09:00', close: '17:00' }] },
        labourRateCents: 6000,
        royaltyRateBp: 500,
      })
      .returning();
    return row!.id;
  };
  ids.a = await shop('Alder Quay', 'America/New_York');
  ids.b = await shop('Birch Reach', 'America/New_York');
  ids.c = await shop('Cedar Flats', 'America/Chicago');
  await db().insert(networkSettings).values({ id: 1, networkName: 'Test network' });
  const reelOf: Record<number, { customerId: number; reelId: number }> = {};
  for (const shopId of Object.values(ids)) {
    const [c] = await db().insert(customers).values({ shopId, name: 'Customer' }).returning();
    const [r] = await db()
      .insert(reels)
      .values({ customerId: c!.id, kind: 'spinning', maker: 'Inventedco', model: 'Gull 30' })
      .returning();
    reelOf[shopId] = { customerId: c!.id, reelId: r!.id };
  }
  const collected = async (shopId: number, at: Date, back?: { days: number; counted: boolean }) => {
    const [row] = await db()
      .insert(jobs)
      .values({
        shopId,
        ...reelOf[shopId]!,
        serviceType: 'tune_up',
        state: 'collected',
        checkedInAt: new Date(at.getTime() - 3 * DAY),
        readyAt: new Date(at.getTime() - DAY),
        collectedAt: at,
      } as NewJob)
      .returning();
    if (!back) return;
    const detectedAt = new Date(at.getTime() + back.days * DAY);
    const [again] = await db()
      .insert(jobs)
      .values({
        shopId,
        ...reelOf[shopId]!,
        serviceType: 'repair',
        state: 'checked_in',
        checkedInAt: detectedAt,
        comebackOfJobId: row!.id,
      } as NewJob)
      .returning();
    await db()
      .insert(comebacks)
      .values({
        jobId: again!.id,
        originalJobId: row!.id,
        originalShopId: shopId,
        status: 'confirmed',
        attribution: back.counted ? 'workmanship' : 'customer_damage',
        detectedAt,
        daysSinceCollection: Math.floor(back.days),
      });
  };
  // Reference: 60 jobs a shop in June and September 2025; one in ten comes back, spread over the
  // window, and one in thirty comes back for a reason that does not count.
  for (const [s, shopId] of [ids.a, ids.b].entries()) {
    for (let i = 0; i < 120; i++) {
      const month = i < 60 ? '2025-06' : '2025-09';
      const at = new Date(`${month}-${String(1 + (i % 28)).padStart(2, '0')}T15:00:00Z`);
      at.setUTCHours(13 + ((i * 7 + s) % 8), (i * 13) % 60);
      const back =
        i % 10 === s
          ? { days: 2 + ((i * 11) % 85) + 0.3, counted: true }
          : i % 30 === 7
            ? { days: 5.5, counted: false }
            : undefined;
      await collected(shopId, at, back);
    }
  }
  // April 2026: Alder Quay 40 jobs, one in four back within 20 days; Birch Reach 40, one in
  // twenty back; Cedar Flats a single job, back after 3 days.
  for (let i = 0; i < 40; i++) {
    const at = new Date(`2026-04-${String(1 + (i % 30)).padStart(2, '0')}T14:00:00Z`);
    at.setUTCMinutes((i * 17) % 60);
    await collected(
      ids.a,
      at,
      i % 4 === 1 ? { days: 1 + (i % 19) + 0.5, counted: true } : undefined,
    );
    await collected(
      ids.b,
      new Date(at.getTime() + 3 * 3_600_000),
      i % 20 === 3 ? { days: 6.2, counted: true } : undefined,
    );
  }
  await collected(ids.c, new Date('2026-04-10T16:00:00Z'), { days: 3.1, counted: true });
}

beforeAll(async () => {
  handle = await freshDb(TARGET);
  await migrate(handle.db, handle.driver);
  await build();
}, 120_000);

afterAll(async () => {
  await handle?.close();
});

/** What the metrics engine makes of the raw rows: each collected job and its first counted comeback. */
async function rawRows(period: { from: string; to: string }, shopId: number | null) {
  const after = new Date(Date.parse(`${period.to}T00:00:00Z`) + DAY).toISOString().slice(0, 10);
  const { rows } = await db().execute<{
    shop_id: number;
    collected_at: string | Date;
    back: string | Date | null;
  }>(sql`
    select j.shop_id, j.collected_at,
      (select min(cb.detected_at) from comebacks cb
        where cb.original_job_id = j.id and cb.status = 'confirmed'
          and cb.attribution in ('workmanship', 'part_failure')) as back
    from jobs j join shops s on s.id = j.shop_id
    where j.collected_at >= (${period.from}::timestamp at time zone s.time_zone)
      and j.collected_at < (${after}::timestamp at time zone s.time_zone)
      ${shopId === null ? sql`` : sql`and j.shop_id = ${shopId}`}`);
  return rows.map((r): FollowUpRow => ({
    collectedAt: new Date(r.collected_at),
    comebackAt: r.back === null ? null : new Date(r.back),
  }));
}

const settings = { warrantyDays: W, countedAttributions: ['workmanship', 'part_failure'] as const };

describe(`comeback follow-up (${TARGET})`, () => {
  it('reference period – the twelve months before, day clamped to the month', () => {
    expect(referencePeriod({ from: '2026-04-01', to: '2026-04-30' }, 12)).toEqual({
      from: '2025-04-01',
      to: '2026-03-31',
    });
    expect(monthsBefore('2024-03-31', 1)).toBe('2024-02-29');
    expect(monthsBefore('2026-01-15', 13)).toBe('2024-12-15');
  });

  it.each([
    ['April, as of 15 May', { from: '2026-04-01', to: '2026-04-30' }, '2026-05-15T12:00:00Z'],
    [
      'April, as of 18 April (the current month)',
      { from: '2026-04-01', to: '2026-04-30' },
      '2026-04-18T09:30:00Z',
    ],
    [
      '5 – 24 April, as of 1 June',
      { from: '2026-04-05', to: '2026-04-24' },
      '2026-06-01T12:00:00Z',
    ],
    ['June 2025, final', { from: '2025-06-01', to: '2025-06-30' }, '2026-05-15T12:00:00Z'],
  ])(
    'owner – each shop’s follow-up is what @reelwright/metrics makes of the raw rows: %s',
    async (_, period, iso) => {
      const asOf = new Date(iso);
      const tables = await followUpTables(db(), null, period, asOf, {
        ...settings,
        countedAttributions: [...settings.countedAttributions],
        referenceMonths: 12,
      });
      for (const id of Object.values(ids)) {
        const expected = followUpTable(await rawRows(period, id), { asOf, warrantyDays: W });
        const got = tables.get(String(id));
        if (expected.events.every((e) => e === 0) && expected.censored.every((c) => c === 0)) {
          expect(got).toBeUndefined();
        } else expect(got, String(id)).toEqual(expected);
      }
    },
  );

  it('owner – an open month is judged by O/E against the network reference, as the engine does', async () => {
    const period = { from: '2026-04-01', to: '2026-04-30' };
    const asOf = new Date('2026-05-15T12:00:00Z');
    const r = await networkComparison(owner, period, { db: db(), asOf, referenceCache: false });
    const refRows = await rawRows(referencePeriod(period, 12), null);
    const reference = comebackReference(followUpTable(refRows, { asOf, warrantyDays: W }), W)!;
    expect(r.reference).toEqual({
      from: '2025-04-01',
      to: '2026-03-31',
      jobs: 240,
      probability: reference.probability,
    });
    const estimates = await Promise.all(
      r.shops.map(async (s) =>
        comebackEstimate(
          followUpTable(await rawRows(period, s.shop.id), { asOf, warrantyDays: W }),
          {
            warrantyDays: W,
            reference,
          },
        ),
      ),
    );
    const bands = compareRatios(
      estimates.map((e, i) => ({
        shopId: String(r.shops[i]!.shop.id),
        observed: e.events,
        expected: e.ratio!.expected,
      })),
    );
    for (const [i, s] of r.shops.entries()) {
      const e = estimates[i]!;
      expect(s.comebacks.comparison).toBe('ratio');
      expect(s.comebacks.estimate).toMatchObject({
        method: e.method,
        jobs: e.jobs,
        events: e.events,
        stillFollowed: e.stillFollowed,
        final: e.final,
      });
      expect(s.comebacks.estimate.probability).toBeCloseTo(e.probability!, 12);
      expect(s.comebacks.rate).toBe(s.comebacks.estimate.probability);
      expect(s.comebacks.ratio!.observed).toBe(e.events);
      expect(s.comebacks.ratio!.expected).toBeCloseTo(e.ratio!.expected, 9);
      expect(s.comebacks.ratio!.band).toBe(bands[i]!.band);
    }
    const by = (name: string) => r.shops.find((s) => s.shop.name === name)!.comebacks;
    // Nobody collected in April has been followed for 90 days by 15 May: the network's curve
    // carried by each shop's ratio.
    expect(by('Alder Quay').estimate.method).toBe('network × ratio');
    // Ten of forty back within three weeks, against a tenth expected over the whole window.
    expect(by('Alder Quay').ratio!.side).toBe('high');
    expect(by('Alder Quay').band).not.toBe('in line');
    // One job, back after three days: O/E is large, but one comeback supports no band.
    expect(by('Cedar Flats').ratio).toMatchObject({ observed: 1, band: 'in line' });
    expect(by('Cedar Flats').band).toBe('in line');
    expect(r.network.comebacks.comparison).toBe('ratio');
    expect(r.network.comebacks.estimate.stillFollowed).toBe(
      estimates.reduce((t, e) => t + e.stillFollowed, 0),
    );
  });

  it('owner – a final period keeps the binomial comparison, its estimate equal to the final rate', async () => {
    const period = { from: '2025-06-01', to: '2025-06-30' };
    const r = await networkComparison(owner, period, {
      db: db(),
      asOf: new Date('2026-05-15T12:00:00Z'),
    });
    expect(r.reference).toBeNull();
    for (const s of r.shops.filter((x) => x.comebacks.collected > 0)) {
      expect(s.comebacks.comparison).toBe('binomial');
      expect(s.comebacks.estimate).toMatchObject({
        method: 'kaplan-meier',
        final: true,
        stillFollowed: 0,
      });
      expect(s.comebacks.estimate.probability).toBeCloseTo(
        s.comebacks.events / s.comebacks.trials,
        12,
      );
      expect(s.comebacks.rate).toBe(s.comebacks.events / s.comebacks.trials);
      // The same estimate and interval as the engine's on each job's own follow-up.
      const engine = comebackEstimate(
        followUpTable(await rawRows(period, s.shop.id), {
          asOf: new Date('2026-05-15T12:00:00Z'),
          warrantyDays: W,
        }),
        { warrantyDays: W },
      );
      expect(s.comebacks.estimate.probability).toBeCloseTo(engine.probability!, 12);
      expect(s.comebacks.estimate.interval!.lower).toBeCloseTo(engine.interval!.lower, 12);
      expect(s.comebacks.estimate.interval!.upper).toBeCloseTo(engine.interval!.upper, 12);
    }
  });

  it('owner – the shop page carries the same estimate as the network view', async () => {
    const period = { from: '2026-04-01', to: '2026-04-30' };
    const asOf = new Date('2026-05-15T12:00:00Z');
    const [net, page] = await Promise.all([
      networkComparison(owner, period, { db: db(), asOf }),
      shopMetrics(owner, ids.a, period, { db: db(), asOf }),
    ]);
    expect(page.figures.comebacks).toEqual(net.shops.find((s) => s.shop.id === ids.a)!.comebacks);
  });

  it('owner – the monthly trend shows each month as the comparison estimates it, final or not', async () => {
    const asOf = new Date('2026-05-15T12:00:00Z');
    const ctx = { db: db(), asOf, referenceCache: false };
    const trend = await networkTrends(
      owner,
      { from: '2025-05-01', to: '2026-04-30', metric: 'comebacks' },
      ctx,
    );
    if (trend.metric !== 'comebacks') throw new Error('wrong metric');
    expect(trend.warrantyDays).toBe(W);
    for (const label of ['2025-06', '2025-09', '2026-04']) {
      const [y, m] = label.split('-').map(Number) as [number, number];
      const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
      const month = await networkComparison(
        owner,
        { from: `${label}-01`, to: `${label}-${last}` },
        ctx,
      );
      for (const s of month.shops.filter((x) => x.comebacks.collected > 0)) {
        const point = trend.shops
          .find((t) => t.shop.id === s.shop.id)!
          .points.find((p) => p.label === label)!;
        const e = s.comebacks.estimate;
        expect(point, `${s.shop.name} ${label}`).toMatchObject({
          trials: e.jobs,
          events: e.events,
          stillFollowed: e.stillFollowed,
          method: e.method,
          provisional: !e.final,
        });
        expect(point.rate).toBeCloseTo(e.probability!, 12);
        expect(point.interval!.lower).toBeCloseTo(e.interval!.lower, 12);
        expect(point.interval!.upper).toBeCloseTo(e.interval!.upper, 12);
        // Limits and signals only where the month is final.
        if (e.final) expect(point.upper).not.toBeNull();
        else expect(point).toMatchObject({ lower: null, upper: null, signal: null });
      }
    }
    const alder = trend.shops.find((t) => t.shop.id === ids.a)!;
    expect(alder.points.find((p) => p.label === '2026-04')).toMatchObject({
      provisional: true,
      method: 'network × ratio',
    });
    expect(alder.points.find((p) => p.label === '2025-06')!.provisional).toBe(false);
  });
});
