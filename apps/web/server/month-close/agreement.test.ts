import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { getMonthClose } from '../queries/month-close';
import { networkComparison } from '../queries/network';
import { closeMonth } from './close';
import { buildMonthCloseNetwork } from './test-network';

// Month close and the network comparison compute the same figures by different roads (the
// month's frozen rows, and the comparison's aggregates over the period); for a closed month they
// must agree shop by shop wherever their definitions are the same.

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
const MONTH = '2026-11';
const NOW = new Date('2026-12-02T12:00:00Z');

beforeAll(async () => {
  await openMemoryDb();
  net = await buildMonthCloseNetwork(state.handle!.db);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

describe('month close and the network comparison', () => {
  it('owner – a closed month reads the same in both, shop by shop', async () => {
    await closeMonth(net.owner, MONTH, { now: NOW });
    const report = await getMonthClose(net.owner, MONTH, { now: NOW });
    expect(report.status).toBe('closed');
    const comparison = await networkComparison(
      net.owner,
      { from: `${MONTH}-01`, to: `${MONTH}-30` },
      { asOf: NOW, referenceCache: false },
    );
    expect(report.shops.length).toBeGreaterThan(1);
    // Figures to compare, not only empty ones.
    expect(report.shops.some((s) => s.customerTurnaround.medianMinutes !== null)).toBe(true);
    expect(report.shops.some((s) => s.comebackEstimate?.probability != null)).toBe(true);
    expect(report.shops.some((s) => s.onTime.total > 0)).toBe(true);
    for (const closed of report.shops) {
      const shop = comparison.shops.find((s) => s.shop.id === closed.shop.id);
      expect(shop, closed.shop.name).toBeDefined();
      const name = closed.shop.name;
      expect(shop!.jobsReady, name).toBe(closed.jobs.ready);
      expect(shop!.customerTurnaround.count, name).toBe(closed.customerTurnaround.count);
      expect(shop!.customerTurnaround.median, name).toBe(closed.customerTurnaround.medianMinutes);
      expect(shop!.customerTurnaround.p90, name).toBe(closed.customerTurnaround.p90Minutes);
      expect(shop!.benchTurnaround.count, name).toBe(closed.benchTurnaround.count);
      expect(shop!.benchTurnaround.median, name).toBe(closed.benchTurnaround.medianMinutes);
      expect(shop!.benchTurnaround.p90, name).toBe(closed.benchTurnaround.p90Minutes);
      expect(shop!.onTime, name).toEqual(closed.onTime);
      const estimate = closed.comebackEstimate!;
      expect(shop!.comebacks.collected, name).toBe(closed.jobs.collected);
      expect(shop!.comebacks.estimate.events, name).toBe(estimate.observed);
      expect(shop!.comebacks.estimate.stillFollowed, name).toBe(estimate.stillFollowed);
      expect(shop!.comebacks.estimate.final, name).toBe(estimate.final);
      if (estimate.probability === null) {
        expect(shop!.comebacks.estimate.probability, name).toBeNull();
      } else {
        expect(shop!.comebacks.estimate.probability, name).toBeCloseTo(estimate.probability, 12);
      }
    }
  });
});
