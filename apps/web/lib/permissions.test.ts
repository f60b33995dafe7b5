import { describe, expect, it } from 'vitest';
import { can, PERMISSIONS, ROLES, type Permission, type Role } from './permissions';

// The expected grid, written out in full so that any change to the table is a visible test change.
const Y = true;
const N = false;
const expected: Record<Permission, Record<Role, boolean>> = {
  //                                owner regional_manager shop_lead technician auditor
  'account:read': row(Y, Y, Y, Y, Y),
  'shops:read': row(Y, Y, Y, Y, N),
  'network:read': row(Y, Y, N, N, N),
  'jobs:read': row(Y, Y, Y, Y, N),
  'jobs:write': row(N, N, Y, Y, N),
  'jobs:import': row(N, N, Y, N, N),
  'comebacks:read': row(Y, Y, Y, Y, N),
  'comebacks:review': row(Y, Y, Y, N, N),
  'audits:read': row(Y, Y, Y, N, Y),
  'audits:plan': row(Y, Y, N, N, N),
  'audits:score': row(N, N, N, N, Y),
  'corrective-actions:manage': row(Y, Y, Y, N, N),
  'corrective-actions:verify': row(Y, Y, N, N, N),
  'month-close:read': row(Y, Y, N, N, N),
  'month-close:manage': row(Y, N, N, N, N),
  'reminders:send': row(N, N, Y, N, N),
  'account:write': row(Y, Y, Y, Y, Y),
  'people:read': row(Y, Y, N, N, N),
  'users:manage': row(Y, N, N, N, N),
  'settings:manage': row(Y, N, N, N, N),
  'dev-mail:read': row(Y, N, N, N, N),
};

function row(o: boolean, rm: boolean, sl: boolean, t: boolean, a: boolean): Record<Role, boolean> {
  return { owner: o, regional_manager: rm, shop_lead: sl, technician: t, auditor: a };
}

describe('role → permission table', () => {
  it('covers every permission', () => {
    expect(Object.keys(expected).sort()).toEqual([...PERMISSIONS].sort());
  });

  for (const permission of PERMISSIONS) {
    for (const role of ROLES) {
      const allowed = expected[permission][role];
      it(`${role} ${allowed ? 'may' : 'may not'} ${permission}`, () => {
        expect(can(role, permission)).toBe(allowed);
      });
    }
  }
});
