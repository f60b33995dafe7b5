import { and, asc, eq, sql } from '@reelwright/db';
import { jobs, regions, shops } from '@reelwright/db/schema';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { shopScope } from './scope';

export interface ShopSummary {
  id: number;
  name: string;
  slug: string;
  timeZone: string;
  region: { id: number; name: string };
  /** False once the owner has closed the shop: it takes no new jobs. */
  active: boolean;
  labourRateCents: number;
  royaltyRateBp: number;
  currency: string;
  /** Jobs still being worked: checked in, on the bench or waiting on parts. */
  openJobs: number;
  waitingOnParts: number;
  /** Finished jobs the customer has not collected yet. */
  readyForPickup: number;
  /** Jobs that became ready since Monday 00:00 in the shop's own time zone. */
  readyThisWeek: number;
}

const openStates = sql`('checked_in', 'on_bench', 'waiting_parts')`;

/** The shops the caller may see, with live counts of their work. */
export async function listShops(principal: Principal, options: { id?: number } = {}) {
  const conn = await db();
  const weekStart = sql`(date_trunc('week', now() at time zone ${shops.timeZone}) at time zone ${shops.timeZone})`;
  const rows = await conn
    .select({
      id: shops.id,
      name: shops.name,
      slug: shops.slug,
      timeZone: shops.timeZone,
      active: shops.active,
      labourRateCents: shops.labourRateCents,
      royaltyRateBp: shops.royaltyRateBp,
      currency: shops.currency,
      regionId: regions.id,
      regionName: regions.name,
      openJobs:
        sql<number>`count(${jobs.id}) filter (where ${jobs.state} in ${openStates})`.mapWith(
          Number,
        ),
      waitingOnParts:
        sql<number>`count(${jobs.id}) filter (where ${jobs.state} = 'waiting_parts')`.mapWith(
          Number,
        ),
      readyForPickup: sql<number>`count(${jobs.id}) filter (where ${jobs.state} = 'ready')`.mapWith(
        Number,
      ),
      readyThisWeek:
        sql<number>`count(${jobs.id}) filter (where ${jobs.readyAt} >= ${weekStart})`.mapWith(
          Number,
        ),
    })
    .from(shops)
    .innerJoin(regions, eq(regions.id, shops.regionId))
    .leftJoin(jobs, eq(jobs.shopId, shops.id))
    .where(
      and(shopScope(principal), options.id === undefined ? undefined : eq(shops.id, options.id)),
    )
    .groupBy(shops.id, regions.id)
    .orderBy(asc(regions.name), asc(shops.name));
  return rows.map((r): ShopSummary => ({
    id: r.id,
    name: r.name,
    slug: r.slug,
    timeZone: r.timeZone,
    region: { id: r.regionId, name: r.regionName },
    active: r.active,
    labourRateCents: r.labourRateCents,
    royaltyRateBp: r.royaltyRateBp,
    currency: r.currency,
    openJobs: r.openJobs,
    waitingOnParts: r.waitingOnParts,
    readyForPickup: r.readyForPickup,
    readyThisWeek: r.readyThisWeek,
  }));
}

/** One shop inside the caller's scope; a shop outside it is reported as not found. */
export async function getShop(principal: Principal, id: number): Promise<ShopSummary> {
  const [shop] = await listShops(principal, { id });
  if (!shop) throw notFound('shop');
  return shop;
}
