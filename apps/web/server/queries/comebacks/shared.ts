// Aliases, the caller's shops and review rights shared by the comeback reads.
import { aliasedTable, asc, inArray, or, sql, type SQL } from '@reelwright/db';
import { comebacks, jobs, shops, users } from '@reelwright/db/schema';
import { can } from '~/lib/permissions';
import { db } from '../../db';
import type { Principal } from '../../principal';
import { shopScope } from '../scope';

export const DAY = 86_400_000;

export const returnJob = aliasedTable(jobs, 'return_job');
export const originalJob = aliasedTable(jobs, 'original_job');
export const returnShop = aliasedTable(shops, 'return_shop');
export const originalShop = aliasedTable(shops, 'original_shop');
export const assignee = aliasedTable(users, 'assignee');
export const reviewer = aliasedTable(users, 'reviewer');
export const originalTech = aliasedTable(users, 'original_tech');

/** The shops in the caller's scope, with their region. */
export async function scopeShops(principal: Principal) {
  const conn = await db();
  return conn
    .select({ id: shops.id, name: shops.name, regionId: shops.regionId, timeZone: shops.timeZone })
    .from(shops)
    .where(shopScope(principal))
    .orderBy(asc(shops.name));
}

export interface ReviewRights {
  /** May confirm, dismiss and attribute: the original shop's lead or the assignee, or a manager or the owner in scope. */
  canReview: boolean;
  /** May hand the review to another person: a regional manager or the owner in scope. */
  canReassign: boolean;
}

/** Who may review a comeback: never decided by the request, always from the role and scope. */
export function reviewRights(
  principal: Principal,
  comeback: { originalShopId: number; originalRegionId: number; assigneeId: number | null },
): ReviewRights {
  if (!can(principal.role, 'comebacks:review')) return { canReview: false, canReassign: false };
  const scope = principal.scope;
  const managerInScope =
    (principal.role === 'owner' && scope.kind === 'network') ||
    (principal.role === 'regional_manager' &&
      scope.kind === 'region' &&
      scope.regionId === comeback.originalRegionId);
  const lead =
    principal.role === 'shop_lead' &&
    scope.kind === 'shop' &&
    (scope.shopId === comeback.originalShopId || comeback.assigneeId === principal.id);
  return { canReview: managerInScope || lead, canReassign: managerInScope };
}

export const reelLabel = (r: { maker: string; model: string; size: string | null }) =>
  [r.maker, r.model, r.size].filter(Boolean).join(' ');

/** Where the caller may read a comeback: its original shop or the shop the reel came back to. */
export function readScope(shopIds: number[]): SQL {
  if (shopIds.length === 0) return sql`false`;
  return or(inArray(comebacks.originalShopId, shopIds), inArray(returnJob.shopId, shopIds))!;
}
