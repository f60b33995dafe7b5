import { and, eq, inArray, sql, type Db, type SQL } from '@reelwright/db';
import { auditRounds, shops } from '@reelwright/db/schema';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';

/** The condition on `shops` that keeps a query inside the caller's scope (undefined: the whole network). */
export function shopScope(principal: Principal): SQL | undefined {
  switch (principal.scope.kind) {
    case 'network':
      return undefined;
    case 'region':
      return eq(shops.regionId, principal.scope.regionId);
    case 'shop':
      return eq(shops.id, principal.scope.shopId);
    case 'rounds':
      return inArray(
        shops.id,
        sql`(select ${auditRounds.shopId} from ${auditRounds} where ${auditRounds.auditorId} = ${principal.id})`,
      );
  }
}

/**
 * Shops open at some time between two local dates (inclusive, in each shop's zone): opened by the
 * last day and not closed before the first. A shop opened later or closed earlier has no part in
 * the period's figures.
 */
export function openDuring(from: string, to: string): SQL {
  return sql`((${shops.openedAt} is null or (${shops.openedAt} at time zone ${shops.timeZone})::date <= ${to}::date)
    and (${shops.closedAt} is null or (${shops.closedAt} at time zone ${shops.timeZone})::date >= ${from}::date))`;
}

/** The same scope applied to any table's shop column, given the ids of the shops in scope. */
export function inShops(column: Parameters<typeof inArray>[0], shopIds: readonly number[]): SQL {
  return inArray(column, [...shopIds]);
}

export interface ScopedShop {
  id: number;
  name: string;
  regionId: number;
  timeZone: string;
}

/**
 * The shop a list filter names (`?shop=`, `?shopId=`), checked against the caller's scope: a shop
 * outside it and one that does not exist are the same 404, so the filter never reveals which
 * shops exist. Every list route that takes a shop filter goes through here.
 */
export async function shopInScope(
  principal: Principal,
  shopId: number,
  conn?: Db,
): Promise<ScopedShop> {
  const [shop] = await (conn ?? (await db()))
    .select({ id: shops.id, name: shops.name, regionId: shops.regionId, timeZone: shops.timeZone })
    .from(shops)
    .where(and(eq(shops.id, shopId), shopScope(principal)));
  if (!shop) throw notFound('shop');
  return shop;
}

/** `shopInScope` for an optional filter: nothing to check when the caller named no shop. */
export async function shopFilter(
  principal: Principal,
  shopId: number | undefined,
  conn?: Db,
): Promise<ScopedShop | undefined> {
  return shopId === undefined ? undefined : shopInScope(principal, shopId, conn);
}
