import { can, type Permission, type Role } from './permissions';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** Shown only to roles that work across shops (a shop's own people get "My shop"). */
  multiShop?: boolean;
}

// Only sections that work are listed; each role sees the ones its permissions allow.
const ITEMS: NavItem[] = [
  { href: '/', label: 'Home', permission: 'shops:read' },
  { href: '/shops', label: 'Shops', permission: 'network:read', multiShop: true },
  { href: '/month-close', label: 'Month close', permission: 'month-close:read' },
  { href: '/reminders', label: 'Reminders', permission: 'reminders:send' },
  { href: '/settings', label: 'Settings', permission: 'settings:manage' },
];

export function navFor(role: Role, shopId: number | null): NavItem[] {
  const items = ITEMS.filter((item) => can(role, item.permission));
  if (shopId != null)
    items.splice(1, 0, { href: `/shops/${shopId}`, label: 'My shop', permission: 'shops:read' });
  return items;
}
