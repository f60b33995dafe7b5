import { eq, inArray, type SQL } from '@reelwright/db';
import { shops } from '@reelwright/db/schema';
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
  }
}

/** The same scope applied to any table's shop column, given the ids of the shops in scope. */
export function inShops(column: Parameters<typeof inArray>[0], shopIds: readonly number[]): SQL {
  return inArray(column, [...shopIds]);
}
