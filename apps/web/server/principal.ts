import type { Role } from '~/lib/permissions';

// An auditor's scope is the shops of the audit rounds assigned to them, never the whole network.
export type Scope =
  | { kind: 'network' }
  | { kind: 'region'; regionId: number }
  | { kind: 'shop'; shopId: number }
  | { kind: 'rounds' };

/** The signed-in caller, as loaded fresh from the database on every request. */
export interface Principal {
  id: number;
  name: string;
  email: string;
  role: Role;
  shopId: number | null;
  regionId: number | null;
  scope: Scope;
}

export function scopeOf(user: {
  role: Role;
  shopId: number | null;
  regionId: number | null;
}): Scope {
  if (user.role === 'shop_lead' || user.role === 'technician') {
    if (user.shopId == null) throw new Error(`A ${user.role} must belong to a shop`);
    return { kind: 'shop', shopId: user.shopId };
  }
  if (user.role === 'regional_manager') {
    if (user.regionId == null) throw new Error('A regional manager must have a region');
    return { kind: 'region', regionId: user.regionId };
  }
  if (user.role === 'auditor') return { kind: 'rounds' };
  return { kind: 'network' };
}
