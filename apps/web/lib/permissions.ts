// Role → permission table: the single source of truth for what each role may do.
import { USER_ROLES } from '@reelwright/db/values';

/** The roles, as the database's `user_role` enum has them. */
export const ROLES = USER_ROLES;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'account:read',
  'shops:read',
  'network:read',
  'jobs:read',
  'jobs:write',
  'jobs:import',
  'comebacks:read',
  'comebacks:review',
  'audits:read',
  'audits:plan',
  'audits:score',
  'corrective-actions:manage',
  'corrective-actions:verify',
  'month-close:read',
  'month-close:manage',
  'reminders:send',
  'account:write',
  'people:read',
  'users:manage',
  'settings:manage',
  'dev-mail:read',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  owner: [
    'account:read',
    'account:write',
    'people:read',
    'shops:read',
    'network:read',
    'jobs:read',
    'comebacks:read',
    'comebacks:review',
    'audits:read',
    'audits:plan',
    'corrective-actions:manage',
    'corrective-actions:verify',
    'month-close:read',
    'month-close:manage',
    'users:manage',
    'settings:manage',
    'dev-mail:read',
  ],
  regional_manager: [
    'account:read',
    'account:write',
    'people:read',
    'shops:read',
    'network:read',
    'jobs:read',
    'comebacks:read',
    'comebacks:review',
    'audits:read',
    'audits:plan',
    'corrective-actions:manage',
    'corrective-actions:verify',
    'month-close:read',
  ],
  shop_lead: [
    'account:read',
    'account:write',
    'shops:read',
    'jobs:read',
    'jobs:write',
    'jobs:import',
    'comebacks:read',
    'comebacks:review',
    'audits:read',
    'corrective-actions:manage',
    'reminders:send',
  ],
  technician: [
    'account:read',
    'account:write',
    'shops:read',
    'jobs:read',
    'jobs:write',
    'comebacks:read',
  ],
  // No 'shops:read': an auditor sees a shop only through the rounds assigned to them.
  auditor: ['account:read', 'account:write', 'audits:read', 'audits:score'],
};

export function can(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].includes(permission);
}

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  regional_manager: 'Regional manager',
  shop_lead: 'Shop lead',
  technician: 'Technician',
  auditor: 'Auditor',
};
