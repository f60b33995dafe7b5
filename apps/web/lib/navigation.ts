import { can, type Permission, type Role } from './permissions';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** Shown only to roles that work across shops (a shop's own people get "Shop"). */
  multiShop?: boolean;
}

// Only sections that work are listed; each role sees the ones its permissions allow.
const ITEMS: NavItem[] = [
  { href: '/', label: 'Home', permission: 'account:read' },
  { href: '/bench', label: 'Bench', permission: 'jobs:read' },
  { href: '/network', label: 'Network', permission: 'network:read', multiShop: true },
  { href: '/comebacks', label: 'Comebacks', permission: 'comebacks:read' },
  { href: '/audits', label: 'Audits', permission: 'audits:read' },
  {
    href: '/corrective-actions',
    label: 'Corrective actions',
    permission: 'corrective-actions:manage',
  },
  { href: '/month-close', label: 'Month close', permission: 'month-close:read' },
  { href: '/reminders', label: 'Reminders', permission: 'reminders:send' },
  { href: '/settings', label: 'Settings', permission: 'settings:manage' },
];

export function navFor(
  role: Role,
  shopId: number | null,
  options: { mailCatcher?: boolean } = {},
): NavItem[] {
  const items = ITEMS.filter((item) => can(role, item.permission));
  // The caught-mail page exists only where a local SMTP catcher runs (development and tests).
  if (options.mailCatcher && can(role, 'dev-mail:read'))
    items.push({ href: '/dev/mail', label: 'Caught mail', permission: 'dev-mail:read' });
  if (shopId != null && can(role, 'shops:read'))
    items.splice(1, 0, { href: `/shops/${shopId}`, label: 'Shop', permission: 'shops:read' });
  return items;
}
