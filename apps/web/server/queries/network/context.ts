import { TZDate } from '@date-fns/tz';
import { asc, eq, sql, type Db } from '@reelwright/db';
import { networkSettings, regions, shops } from '@reelwright/db/schema';
import {
  businessDays,
  businessMinutes,
  DEFAULT_COUNTED_ATTRIBUTIONS,
  type ComebackAttribution,
} from '@reelwright/metrics';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { openDuring, shopScope } from '../scope';
import type { ShopRef } from './types';
import * as clock from '~/server/clock';

/** What a network query runs against: a database (default: the app's) and the as-of instant. */
export interface QueryContext {
  db?: Db;
  asOf?: Date;
  /** False to rebuild the network's reference curve rather than reuse a recent one (tests). */
  referenceCache?: boolean;
}

export async function resolveContext(ctx: QueryContext = {}) {
  return { conn: ctx.db ?? (await db()), asOf: ctx.asOf ?? clock.now() };
}

export interface NetworkSettingsUsed {
  warrantyDays: number;
  countedAttributions: ComebackAttribution[];
  /** Months before a period whose jobs make the network's reference curve (default 12). */
  referenceMonths: number;
}

/** The owner's warranty window, counted attributions and reference months; defaults when unset. */
export async function loadSettings(conn: Db): Promise<NetworkSettingsUsed> {
  const [row] = await conn
    .select({
      warrantyDays: networkSettings.warrantyDays,
      countedAttributions: networkSettings.countedAttributions,
      referenceMonths: networkSettings.comebackReferenceMonths,
    })
    .from(networkSettings)
    .where(eq(networkSettings.id, 1))
    .limit(1);
  return {
    warrantyDays: row?.warrantyDays ?? 90,
    countedAttributions: row?.countedAttributions ?? [...DEFAULT_COUNTED_ATTRIBUTIONS],
    referenceMonths: row?.referenceMonths ?? 12,
  };
}

export interface NetworkShop extends ShopRef {
  /** Inside the caller's scope. */
  visible: boolean;
}

/**
 * Every shop of the network, each marked visible or not for the caller. All of them are needed
 * because each shop is judged against the whole network's rate; only visible ones leave the server.
 */
export async function loadShops(
  conn: Db,
  principal: Principal,
  period?: { from: string; to: string },
): Promise<NetworkShop[]> {
  const scope = shopScope(principal);
  const rows = await conn
    .select({
      id: shops.id,
      name: shops.name,
      slug: shops.slug,
      regionId: regions.id,
      regionName: regions.name,
      timeZone: shops.timeZone,
      openingHours: shops.openingHours,
      labourRateCents: shops.labourRateCents,
      seasonStart: shops.seasonStart,
      seasonEnd: shops.seasonEnd,
      visible: scope ? sql<boolean>`coalesce(${scope}, false)` : sql<boolean>`true`,
    })
    .from(shops)
    .innerJoin(regions, eq(regions.id, shops.regionId))
    .where(period && openDuring(period.from, period.to))
    .orderBy(asc(regions.name), asc(shops.name));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    slug: r.slug,
    region: { id: r.regionId, name: r.regionName },
    timeZone: r.timeZone,
    labourRateCents: r.labourRateCents,
    openMinutesPerDay: openMinutesPerDay(r.timeZone, r.openingHours),
    seasonStart: r.seasonStart,
    seasonEnd: r.seasonEnd,
    visible: r.visible === true,
  }));
}

/**
 * Average open minutes per open day of the shop's weekly hours, measured by the metrics engine
 * over one ordinary week (no closed dates): the divisor that turns business minutes into
 * business days. Null for a shop with no opening hours.
 */
export function openMinutesPerDay(
  timeZone: string,
  weekly: Parameters<typeof businessMinutes>[2]['weekly'],
): number | null {
  const key = `${timeZone}|${JSON.stringify(weekly)}`;
  const known = dayLengths.get(key);
  if (known !== undefined) return known;
  const value = measureOpenDay(timeZone, weekly);
  dayLengths.set(key, value);
  return value;
}

// A shop's hours rarely change; measuring them is the slow part of loading the shops. Keyed by
// the zone and hours themselves, so each instance's copy is right without any coordination.
const dayLengths = new Map<string, number | null>();

function measureOpenDay(
  timeZone: string,
  weekly: Parameters<typeof businessMinutes>[2]['weekly'],
): number | null {
  const calendar = { timeZone, weekly, closedDates: [] };
  // Monday 2026-01-05 to the next Monday, local midnight to local midnight.
  const from = new Date(new TZDate(2026, 0, 5, timeZone).getTime());
  const to = new Date(new TZDate(2026, 0, 12, timeZone).getTime());
  const days = businessDays(from, to, calendar);
  return days > 0 ? businessMinutes(from, to, calendar) / days : null;
}

export function toRef(shop: NetworkShop): ShopRef {
  const { visible: _visible, ...ref } = shop;
  return ref;
}

/** One shop in the caller's scope (cheap: no figures); outside the scope it is not found. */
export async function visibleShop(
  principal: Principal,
  shopId: number,
  ctx: QueryContext = {},
): Promise<ShopRef> {
  const { conn } = await resolveContext(ctx);
  const shop = (await loadShops(conn, principal)).find((s) => s.id === shopId && s.visible);
  if (!shop) throw notFound('shop');
  return toRef(shop);
}

/** The warranty window and counted attributions, for pages that need them before the figures. */
export async function networkSettingsUsed(ctx: QueryContext = {}): Promise<NetworkSettingsUsed> {
  const { conn } = await resolveContext(ctx);
  return loadSettings(conn);
}
