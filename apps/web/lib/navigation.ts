import { can, type Permission, type Role } from './permissions';

export type NavGroup = 'Work' | 'Quality' | 'Figures' | 'Admin';

export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  /** The heading the item sits under in the side rail; Home stands alone at the top. */
  group?: NavGroup;
  /** Shown only to roles that work across shops (a shop's own people get "Shop"). */
  multiShop?: boolean;
}

// Only sections that work are listed; each role sees the ones its permissions allow. Items of a
// group stay together, in the order the rail shows them.
const ITEMS: NavItem[] = [
  { href: '/', label: 'Home', permission: 'account:read' },
  { href: '/bench', label: 'Bench', permission: 'jobs:read', group: 'Work' },
  { href: '/comebacks', label: 'Comebacks', permission: 'comebacks:read', group: 'Work' },
  { href: '/reminders', label: 'Reminders', permission: 'reminders:send', group: 'Work' },
  { href: '/audits', label: 'Audits', permission: 'audits:read', group: 'Quality' },
  {
    href: '/corrective-actions',
    label: 'Corrective actions',
    permission: 'corrective-actions:manage',
    group: 'Quality',
  },
  {
    href: '/network',
    label: 'Network',
    permission: 'network:read',
    multiShop: true,
    group: 'Figures',
  },
  { href: '/month-close', label: 'Month close', permission: 'month-close:read', group: 'Figures' },
  { href: '/settings', label: 'Settings', permission: 'settings:manage', group: 'Admin' },
  { href: '/settings/people', label: 'People', permission: 'people:read', group: 'Admin' },
];

export function navFor(
  role: Role,
  shopId: number | null,
  options: { mailCatcher?: boolean } = {},
): NavItem[] {
  const items = ITEMS.filter((item) => can(role, item.permission));
  // The caught-mail page exists only where a local SMTP catcher runs (development and tests).
  if (options.mailCatcher && can(role, 'dev-mail:read'))
    items.push({
      href: '/dev/mail',
      label: 'Caught mail',
      permission: 'dev-mail:read',
      group: 'Admin',
    });
  if (shopId != null && can(role, 'shops:read'))
    items.splice(1, 0, {
      href: `/shops/${shopId}`,
      label: 'Shop',
      permission: 'shops:read',
      group: 'Work',
    });
  return items;
}
