// Words for people's statuses and the changes in their history, shared by the pages.

export const STATUS_LABELS = {
  active: 'Active',
  invited: 'Invited',
  deactivated: 'Deactivated',
} as const;

const ACTION_LABELS: Record<string, string> = {
  'user.invite': 'Invited',
  'user.invite_resend': 'Invitation sent again',
  'user.invite_withdraw': 'Invitation withdrawn',
  'user.invite_accept': 'Set their password from the invitation',
  'user.password_reset_request': 'Asked for a password reset link',
  'user.password_reset': 'Set a new password from a reset link',
  'user.password_change': 'Changed their password',
  'user.update': 'Changed',
  'user.deactivate': 'Deactivated',
  'user.reactivate': 'Reactivated',
};

export const actionLabel = (action: string) => ACTION_LABELS[action] ?? action;

const FIELD_LABELS: Record<string, string> = {
  name: 'Name',
  role: 'Role',
  shopId: 'Shop',
  regionId: 'Region',
  active: 'Active',
};

/** "Shop: Marram Point → Fennel Cove" for each field a change touched. */
export function describeChange(
  before: Record<string, unknown> | null,
  after: Record<string, unknown> | null,
  names: {
    shops: Map<number, string>;
    regions: Map<number, string>;
    roles: Record<string, string>;
  },
): string[] {
  if (!before || !after) return [];
  const show = (key: string, value: unknown): string => {
    if (value === null || value === undefined) return 'none';
    if (key === 'shopId') return names.shops.get(Number(value)) ?? `shop ${String(value)}`;
    if (key === 'regionId') return names.regions.get(Number(value)) ?? `region ${String(value)}`;
    if (key === 'role') return names.roles[String(value)] ?? String(value);
    if (typeof value === 'boolean') return value ? 'yes' : 'no';
    return String(value);
  };
  return Object.keys(after)
    .filter((k) => k in FIELD_LABELS)
    .map((k) => `${FIELD_LABELS[k]}: ${show(k, before[k])} → ${show(k, after[k])}`);
}
