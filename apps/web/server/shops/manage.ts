import { and, asc, eq, gte, isNull, sql, type Tx } from '@reelwright/db';
import {
  activityLog,
  monthCloses,
  regions,
  shopRoyaltyRates,
  shops,
  users,
  type OpeningHours,
} from '@reelwright/db/schema';
import { formatInZone } from '~/lib/format';
import {
  WEEKDAYS,
  type RegionCreate,
  type RegionPatch,
  type ShopCreate,
  type ShopPatch,
} from '~/lib/validators/shops';
import { db } from '../db';
import { badRequest, conflict, notFound } from '../errors';
import type { Principal } from '../principal';
import { getShop, type ShopSummary } from '../queries/shops';
import * as clock from '~/server/clock';

async function log(
  tx: Tx,
  entry: {
    principal: Principal;
    action: string;
    entityType: 'shop' | 'region';
    entityId: number;
    shopId: number | null;
    before?: Record<string, unknown> | null;
    after?: Record<string, unknown> | null;
    at: Date;
  },
) {
  await tx.insert(activityLog).values({
    at: entry.at,
    userId: entry.principal.id,
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId,
    shopId: entry.shopId,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}

const slugOf = (name: string) =>
  name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')
    .slice(0, 60) || 'shop';

async function assertRegion(tx: Tx, regionId: number) {
  const [region] = await tx
    .select({ id: regions.id })
    .from(regions)
    .where(eq(regions.id, regionId));
  if (!region) throw notFound('region');
}

/**
 * `POST /api/shops`: opens a shop with its region, zone, weekly hours, closed dates, rates and
 * currency. Its slug comes from the name (made unique); it starts with no jobs and no figures.
 */
export async function openShop(
  principal: Principal,
  input: ShopCreate,
  options: { now?: Date } = {},
): Promise<ShopSummary> {
  const now = options.now ?? clock.now();
  const weekly: OpeningHours = Object.fromEntries(
    WEEKDAYS.filter((d) => input.weekly[d].length > 0).map((d) => [d, input.weekly[d]]),
  );
  const id = await (
    await db()
  ).transaction(async (tx) => {
    await assertRegion(tx, input.regionId);
    const [sameName] = await tx
      .select({ id: shops.id })
      .from(shops)
      .where(sql`lower(${shops.name}) = lower(${input.name})`);
    if (sameName) throw conflict(`A shop is already called ${input.name}.`);
    const base = slugOf(input.name);
    const taken = new Set(
      (
        await tx
          .select({ slug: shops.slug })
          .from(shops)
          .where(sql`${shops.slug} like ${`${base}%`}`)
      ).map((r) => r.slug),
    );
    let slug = base;
    for (let n = 2; taken.has(slug); n += 1) slug = `${base}-${n}`;
    const [shop] = await tx
      .insert(shops)
      .values({
        regionId: input.regionId,
        name: input.name,
        slug,
        timeZone: input.timeZone,
        openingHours: weekly,
        closedDates: [...input.closedDates].sort(),
        labourRateCents: input.labourRateCents,
        royaltyRateBp: input.royaltyRateBp,
        currency: input.currency,
        openedAt: now,
      })
      .returning();
    await log(tx, {
      principal,
      action: 'shop.open',
      entityType: 'shop',
      entityId: shop!.id,
      shopId: shop!.id,
      after: { ...input, slug },
      at: now,
    });
    return shop!.id;
  });
  return getShop(principal, id);
}

/**
 * `PATCH /api/shops/{id}`: rename, move to another region, change the posted rates, close or
 * reopen. A closed shop keeps its jobs and its figures for the months it was open; it takes no
 * new check-ins. A royalty rate is dated (`scheduleRoyalty`); the posted labour rate applies to
 * work billed from now on.
 */
export async function updateShop(
  principal: Principal,
  id: number,
  patch: ShopPatch,
  options: { now?: Date } = {},
): Promise<ShopSummary> {
  const now = options.now ?? clock.now();
  await (
    await db()
  ).transaction(async (tx) => {
    const [before] = await tx.select().from(shops).where(eq(shops.id, id)).for('update');
    if (!before) throw notFound('shop');
    if (patch.regionId !== undefined) await assertRegion(tx, patch.regionId);
    if (patch.name !== undefined && patch.name.toLowerCase() !== before.name.toLowerCase()) {
      const [sameName] = await tx
        .select({ id: shops.id })
        .from(shops)
        .where(sql`lower(${shops.name}) = lower(${patch.name})`);
      if (sameName) throw conflict(`A shop is already called ${patch.name}.`);
    }
    if (patch.active === false && before.active) {
      // The shop's people would be left without a bench: move or deactivate them first.
      const [staff] = await tx
        .select({ n: sql<number>`count(*)::int` })
        .from(users)
        .where(sql`${users.shopId} = ${id} and ${users.active}`);
      if ((staff?.n ?? 0) > 0)
        throw conflict(
          `${staff!.n} active ${staff!.n === 1 ? 'person works' : 'people work'} at ${before.name}: move or deactivate them before closing it.`,
        );
    }
    const royalty =
      patch.royaltyRateBp === undefined
        ? null
        : await scheduleRoyalty(tx, before, patch.royaltyRateBp, patch.royaltyFrom, now);
    const fields = ['name', 'regionId', 'labourRateCents', 'active'] as const;
    const changed = fields.filter((k) => patch[k] !== undefined && patch[k] !== before[k]);
    if (royalty?.current && before.royaltyRateBp !== patch.royaltyRateBp) {
      await tx.update(shops).set({ royaltyRateBp: patch.royaltyRateBp }).where(eq(shops.id, id));
    }
    if (royalty)
      await log(tx, {
        principal,
        action: 'shop.royalty_rate',
        entityType: 'shop',
        entityId: id,
        shopId: id,
        before: { royaltyRateBp: royalty.previous },
        after: { royaltyRateBp: patch.royaltyRateBp, fromMonth: royalty.fromMonth },
        at: now,
      });
    if (changed.length === 0) return;
    const closing = changed.includes('active') ? { closedAt: patch.active ? null : now } : {};
    await tx
      .update(shops)
      .set({ ...Object.fromEntries(changed.map((k) => [k, patch[k]])), ...closing })
      .where(eq(shops.id, id));
    await log(tx, {
      principal,
      action:
        patch.active === false && before.active
          ? 'shop.close'
          : patch.active && !before.active
            ? 'shop.reopen'
            : 'shop.update',
      entityType: 'shop',
      entityId: id,
      shopId: id,
      before: Object.fromEntries(changed.map((k) => [k, before[k]])),
      after: Object.fromEntries(changed.map((k) => [k, patch[k]])),
      at: now,
    });
  });
  return getShop(principal, id);
}

/**
 * Dates a new royalty rate from a month on. Refused (409) when that month or a later one is
 * closed, so a closed month's royalties are never rewritten. The first change records the rate it
 * replaces from 2000-01, so the months before keep it.
 */
async function scheduleRoyalty(
  tx: Tx,
  shop: typeof shops.$inferSelect,
  rateBp: number,
  from: string | undefined,
  now: Date,
): Promise<{ fromMonth: string; previous: number; current: boolean }> {
  const thisMonth = formatInZone(now, shop.timeZone, 'yyyy-MM');
  const fromMonth = from ?? thisMonth;
  const [closed] = await tx
    .select({ month: monthCloses.month })
    .from(monthCloses)
    .where(and(gte(monthCloses.month, fromMonth), isNull(monthCloses.reopenedAt)))
    .orderBy(asc(monthCloses.month))
    .limit(1);
  if (closed)
    throw conflict(
      `${closed.month} is closed: a new royalty rate can start only after the last closed month.`,
    );
  const dated = await tx
    .select()
    .from(shopRoyaltyRates)
    .where(eq(shopRoyaltyRates.shopId, shop.id))
    .orderBy(asc(shopRoyaltyRates.fromMonth));
  const previous =
    dated.filter((r) => r.fromMonth <= fromMonth).at(-1)?.royaltyRateBp ?? shop.royaltyRateBp;
  if (dated.length === 0)
    await tx
      .insert(shopRoyaltyRates)
      .values({ shopId: shop.id, fromMonth: '2000-01', royaltyRateBp: shop.royaltyRateBp });
  await tx
    .insert(shopRoyaltyRates)
    .values({ shopId: shop.id, fromMonth, royaltyRateBp: rateBp })
    .onConflictDoUpdate({
      target: [shopRoyaltyRates.shopId, shopRoyaltyRates.fromMonth],
      set: { royaltyRateBp: rateBp },
    });
  return { fromMonth, previous, current: fromMonth <= thisMonth };
}

/** A shop's dated royalty rates, oldest first (empty while the rate has never changed). */
export async function royaltyRates(shopId: number) {
  return (await db())
    .select({
      fromMonth: shopRoyaltyRates.fromMonth,
      royaltyRateBp: shopRoyaltyRates.royaltyRateBp,
    })
    .from(shopRoyaltyRates)
    .where(eq(shopRoyaltyRates.shopId, shopId))
    .orderBy(asc(shopRoyaltyRates.fromMonth));
}

export interface RegionView {
  id: number;
  name: string;
  code: string;
  shops: number;
  managers: { id: number; name: string }[];
}

/** `GET /api/regions`: every region with its number of shops and its managers. */
export async function listRegions(conn?: Tx): Promise<RegionView[]> {
  const c = conn ?? (await db());
  const rows = await c
    .select({
      id: regions.id,
      name: regions.name,
      code: regions.code,
      // Spelled out: inside a select list the builder would leave the columns unqualified.
      shops: sql<number>`(select count(*)::int from shops s where s.region_id = "regions"."id")`,
    })
    .from(regions)
    .orderBy(asc(regions.name));
  const managers = await c
    .select({ id: users.id, name: users.name, regionId: users.regionId })
    .from(users)
    .where(sql`${users.role} = 'regional_manager' and ${users.active}`)
    .orderBy(asc(users.name));
  return rows.map((r) => ({
    ...r,
    managers: managers.filter((m) => m.regionId === r.id).map(({ id, name }) => ({ id, name })),
  }));
}

async function regionView(tx: Tx, id: number): Promise<RegionView> {
  const region = (await listRegions(tx)).find((r) => r.id === id);
  if (!region) throw notFound('region');
  return region;
}

/** `POST /api/regions`: a new region, empty until shops move or open in it. */
export async function createRegion(
  principal: Principal,
  input: RegionCreate,
  options: { now?: Date } = {},
): Promise<RegionView> {
  const now = options.now ?? clock.now();
  return (await db()).transaction(async (tx) => {
    const [same] = await tx
      .select({ id: regions.id })
      .from(regions)
      .where(sql`${regions.code} = ${input.code} or lower(${regions.name}) = lower(${input.name})`);
    if (same) throw conflict('A region already has this name or code.');
    const [region] = await tx
      .insert(regions)
      .values({ ...input, createdAt: now })
      .returning();
    await log(tx, {
      principal,
      action: 'region.create',
      entityType: 'region',
      entityId: region!.id,
      shopId: null,
      after: input,
      at: now,
    });
    return regionView(tx, region!.id);
  });
}

/**
 * `PATCH /api/regions/{id}`: rename, or make a regional manager this region's manager (they
 * leave their former region; their sessions end, as for any change of scope).
 */
export async function updateRegion(
  principal: Principal,
  id: number,
  patch: RegionPatch,
  options: { now?: Date } = {},
): Promise<RegionView> {
  const now = options.now ?? clock.now();
  return (await db()).transaction(async (tx) => {
    const [before] = await tx.select().from(regions).where(eq(regions.id, id)).for('update');
    if (!before) throw notFound('region');
    if (patch.name !== undefined && patch.name !== before.name) {
      const [same] = await tx
        .select({ id: regions.id })
        .from(regions)
        .where(sql`lower(${regions.name}) = lower(${patch.name}) and ${regions.id} <> ${id}`);
      if (same) throw conflict(`A region is already called ${patch.name}.`);
      await tx.update(regions).set({ name: patch.name }).where(eq(regions.id, id));
      await log(tx, {
        principal,
        action: 'region.update',
        entityType: 'region',
        entityId: id,
        shopId: null,
        before: { name: before.name },
        after: { name: patch.name },
        at: now,
      });
    }
    if (patch.managerId !== undefined) {
      const [manager] = await tx.select().from(users).where(eq(users.id, patch.managerId));
      if (!manager) throw notFound('person');
      if (manager.role !== 'regional_manager' || !manager.active)
        throw badRequest('Some body fields are not valid.', [
          { field: 'body.managerId', message: 'Choose an active regional manager' },
        ]);
      if (manager.regionId !== id) {
        await tx.update(users).set({ regionId: id }).where(eq(users.id, manager.id));
        await tx.insert(activityLog).values({
          at: now,
          userId: principal.id,
          action: 'user.update',
          entityType: 'user',
          entityId: manager.id,
          shopId: null,
          before: { regionId: manager.regionId },
          after: { regionId: id },
        });
      }
    }
    return regionView(tx, id);
  });
}
