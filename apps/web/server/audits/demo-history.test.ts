import {
  auditRounds,
  auditSamples,
  jobs,
  serviceStandards,
  serviceStandardSteps,
} from '@reelwright/db/schema';
import { eq, inArray } from '@reelwright/db';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { addDemoAuditHistory, previousMonths } from './demo-history';
import { buildAuditNetwork, newYorkNoon, type AuditNetwork } from './fixture';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: AuditNetwork;
let duneJobs: number[];
const db = () => state.handle!.db;

beforeAll(async () => {
  await openMemoryDb();
  net = await buildAuditNetwork(state.handle!.db);
  // Dune's October jobs follow a standard with drag steps, none of them ticked.
  const [standard] = await db()
    .insert(serviceStandards)
    .values({ version: 1, title: 'Test standard', publishedAt: new Date('2026-01-01') })
    .returning();
  await db()
    .insert(serviceStandardSteps)
    .values(
      ['drag.washers', 'drag.stack_order', 'drag.setting'].map((code, i) => ({
        standardId: standard!.id,
        group: 'drag' as const,
        position: i + 1,
        code,
        title: code,
      })),
    );
  duneJobs = await net.readyJobs(
    net.shops.dune.id,
    ['2026-10-05', '2026-10-06', '2026-10-07', '2026-10-08', '2026-10-09', '2026-10-12'].map(
      newYorkNoon,
    ),
  );
  await db()
    .update(jobs)
    .set({ serviceStandardId: standard!.id })
    .where(inArray(jobs.id, duneJobs));
  await net.readyJobs(
    net.shops.kelp.id,
    ['2026-10-13', '2026-10-14', '2026-10-15'].map(newYorkNoon),
  );
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

describe('demo audit history', () => {
  it('names the whole months before the current one', () => {
    expect(previousMonths('2026-12-02', 3)).toEqual([
      { from: '2026-09-01', to: '2026-09-30' },
      { from: '2026-10-01', to: '2026-10-31' },
      { from: '2026-11-01', to: '2026-11-30' },
    ]);
    expect(previousMonths('2027-01-15', 1)).toEqual([{ from: '2026-12-01', to: '2026-12-31' }]);
  });

  it('plans and scores a round per shop-month with a lot; unticked drag steps fail the lot', async () => {
    const result = await addDemoAuditHistory({ today: '2026-12-02', months: 2 });
    // October has lots at Dune and Kelp; November and the third shop have none.
    expect(result).toMatchObject({ rounds: 2 });
    const rounds = await db().select().from(auditRounds);
    expect(rounds.every((r) => r.status === 'decided')).toBe(true);
    const samples = await db().select().from(auditSamples);
    expect(samples).toHaveLength(result!.samples);
    expect(samples.every((s) => s.verdict !== null && s.completedAt !== null)).toBe(true);

    const dune = rounds.find((r) => r.shopId === net.shops.dune.id)!;
    expect(dune.decision).toBe('rejected');
    const duneSamples = samples.filter((s) => s.roundId === dune.id);
    expect(duneSamples.every((s) => s.verdict === 'critical_miss')).toBe(true);
    expect(result!.rejected).toBeGreaterThanOrEqual(1);
  });

  it('does nothing once any round exists, so a second demo start keeps the history', async () => {
    expect(await addDemoAuditHistory({ today: '2026-12-02', months: 2 })).toBeNull();
    const rounds = await db().select().from(auditRounds).where(eq(auditRounds.status, 'decided'));
    expect(rounds).toHaveLength(2);
  });
});
