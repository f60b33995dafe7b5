import { eq } from '@reelwright/db';
import { activityLog, monthCloses, users } from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { regionCreate, shopCreate, shopPatch } from '~/lib/validators/shops';
import { closeMemoryDb, openTargetDb, testState as state } from '~/server/testing/memory-db';
import { checkIn } from '../bench/check-in';
import { buildNetwork, type Network } from '../bench/fixture';
import { expectApiError, jobMaker, MON } from '../bench/test-support';
import { shopsIn } from '../month-close/compute';
import { scopeOf } from '../principal';
import { loadShops } from '../queries/network/context';
import { createRegion, listRegions, openShop, updateRegion, updateShop } from './manage';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Network;
const db = () => state.handle!.db;

beforeAll(async () => {
  await openTargetDb();
  net = await buildNetwork(state.handle!.db);
}, 60_000);
afterAll(closeMemoryDb);

const { checkInBody } = jobMaker(() => net);

const week = {
  mon: [],
  tue: [{ open: '09:00', close: '17:00' }],
  wed: [{ open: '09:00', close: '17:00' }],
  thu: [{ open: '09:00', close: '17:00' }],
  fri: [{ open: '09:00', close: '17:00' }],
  sat: [{ open: '09:00', close: '13:00' }],
  sun: [],
};

describe('shops and regions', () => {
  it('owner – opens a shop in a new time zone: no jobs, its slug from the name, the change logged', async () => {
    const input = shopCreate.parse({
      name: 'Juniper Flats',
      regionId: net.regions.north.id,
      timeZone: 'America/Denver',
      weekly: week,
      closedDates: ['2026-12-25'],
      labourRateCents: 6800,
      royaltyRateBp: 600,
      currency: 'USD',
    });
    const shop = await openShop(net.as.owner, input, { now: MON });
    expect(shop).toMatchObject({
      name: 'Juniper Flats',
      slug: 'juniper-flats',
      timeZone: 'America/Denver',
      active: true,
      openJobs: 0,
      region: { name: 'Test North' },
    });
    const log = await db().select().from(activityLog).where(eq(activityLog.shopId, shop.id));
    expect(log.map((l) => l.action)).toEqual(['shop.open']);
    await expectApiError(openShop(net.as.owner, { ...input, name: 'juniper flats' }), 409);
    // Opened on 2 November: in the November network view and month close, not October's.
    const names = async (from: string, to: string) =>
      (await loadShops(db(), net.as.owner, { from, to })).map((s) => s.name);
    expect(await names('2026-11-01', '2026-11-30')).toContain('Juniper Flats');
    expect(await names('2026-10-01', '2026-10-31')).not.toContain('Juniper Flats');
    expect((await shopsIn(db(), undefined, '2026-11')).map((s) => s.name)).toContain(
      'Juniper Flats',
    );
    expect((await shopsIn(db(), undefined, '2026-10')).map((s) => s.name)).not.toContain(
      'Juniper Flats',
    );
  });

  it('validators – an unknown zone, a royalty over 100% and an unknown field are refused by name', () => {
    const bad = shopCreate.safeParse({
      name: 'X',
      regionId: 1,
      timeZone: 'Mars/Olympus_Mons',
      weekly: week,
      closedDates: [],
      labourRateCents: 100,
      royaltyRateBp: 10_001,
      currency: 'usd',
    });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['timeZone', 'royaltyRateBp', 'currency']));
    expect(shopPatch.safeParse({}).success).toBe(false);
    expect(shopPatch.safeParse({ slug: 'x' }).success).toBe(false);
    expect(regionCreate.safeParse({ name: 'West', code: 'W!' }).success).toBe(false);
  });

  it('owner – a shop with people cannot close; once closed it takes no check-in, and its jobs stay', async () => {
    const dune = net.shops.dune.id;
    const { id: before } = await checkIn(net.as.tech, checkInBody(), { now: MON });
    await expectApiError(updateShop(net.as.owner, dune, { active: false }), 409);
    // Everyone moves to Kelp; then Dune closes.
    const staff = await db().select().from(users).where(eq(users.shopId, dune));
    for (const u of staff)
      await db().update(users).set({ shopId: net.shops.kelp.id }).where(eq(users.id, u.id));
    const closed = await updateShop(net.as.owner, dune, { active: false }, { now: MON });
    expect(closed).toMatchObject({ active: false, openJobs: expect.any(Number) });
    expect(closed.openJobs).toBeGreaterThan(0);
    // A principal still scoped to Dune (as an old session would be) is refused.
    const stale = {
      ...net.as.tech,
      shopId: dune,
      scope: scopeOf({ role: 'technician', shopId: dune, regionId: null }),
    };
    const error = await expectApiError(checkIn(stale, checkInBody(), { now: MON }), 409);
    expect(error.detail).toBe('Dune Test Shop is closed: it takes no new jobs.');
    expect(before).toBeGreaterThan(0);
    // Closed on 2 November: still in November's figures, gone from December's.
    expect((await shopsIn(db(), undefined, '2026-11')).map((s) => s.name)).toContain(
      'Dune Test Shop',
    );
    expect((await shopsIn(db(), undefined, '2026-12')).map((s) => s.name)).not.toContain(
      'Dune Test Shop',
    );
    const reopened = await updateShop(net.as.owner, dune, { active: true });
    expect(reopened.active).toBe(true);
    for (const u of staff) await db().update(users).set({ shopId: dune }).where(eq(users.id, u.id));
  });

  it('owner – moves a shop to another region, adds a region and gives it a manager', async () => {
    const moved = await updateShop(net.as.owner, net.shops.kelp.id, {
      regionId: net.regions.south.id,
    });
    expect(moved.region.name).toBe('Test South');
    await updateShop(net.as.owner, net.shops.kelp.id, { regionId: net.regions.north.id });
    const west = await createRegion(net.as.owner, { name: 'Test West', code: 'tw' });
    expect(west).toMatchObject({ name: 'Test West', shops: 0, managers: [] });
    await expectApiError(createRegion(net.as.owner, { name: 'test west', code: 'tw2' }), 409);
    const managed = await updateRegion(net.as.owner, west.id, { managerId: net.as.south.id });
    expect(managed.managers).toEqual([{ id: net.as.south.id, name: 'Sam South' }]);
    const south = (await listRegions()).find((r) => r.name === 'Test South')!;
    expect(south.managers).toEqual([]);
    await expectApiError(updateRegion(net.as.owner, west.id, { managerId: net.as.tech.id }), 400);
    await updateRegion(net.as.owner, south.id, { managerId: net.as.south.id });
  });

  it('owner – a royalty rate from next month leaves this month and the earlier ones as they were; a closed month cannot be rewritten', async () => {
    const reef = net.shops.reef.id;
    const rate = async (month: string) =>
      (await shopsIn(db(), undefined, month)).find((s) => s.id === reef)!.royaltyRateBp;
    // MON is 2 November 2026: the change starts in December.
    const shop = await updateShop(
      net.as.owner,
      reef,
      { royaltyRateBp: 700, royaltyFrom: '2026-12' },
      { now: MON },
    );
    expect(shop.royaltyRateBp).toBe(500);
    expect([
      await rate('2026-10'),
      await rate('2026-11'),
      await rate('2026-12'),
      await rate('2027-03'),
    ]).toEqual([500, 500, 700, 700]);
    // A change from this month applies now and to this month, not to October.
    const now = await updateShop(net.as.owner, reef, { royaltyRateBp: 650 }, { now: MON });
    expect(now.royaltyRateBp).toBe(650);
    expect([await rate('2026-10'), await rate('2026-11'), await rate('2026-12')]).toEqual([
      500, 650, 700,
    ]);
    // With November closed, a rate from November (or earlier) is refused.
    await db().insert(monthCloses).values({ month: '2026-11', figures: {} });
    const error = await expectApiError(
      updateShop(net.as.owner, reef, { royaltyRateBp: 800, royaltyFrom: '2026-10' }, { now: MON }),
      409,
    );
    expect(error.detail).toBe(
      '2026-11 is closed: a new royalty rate can start only after the last closed month.',
    );
    await db().delete(monthCloses);
    expect(shopPatch.safeParse({ royaltyFrom: '2027-01' }).success).toBe(false);
  });
});
