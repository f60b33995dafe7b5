import { z } from 'zod';
import { USER_ROLES } from '@reelwright/db/values';
import { idNumber, text } from './common';

// People (Settings → People, /api/users), invitations and passwords.

/** The shortest password accepted; NIST SP 800-63B §3.1.1.2 asks for at least 8, we ask for 12. */
export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 200;

export const email = z
  .email('Enter an e-mail address such as name@example.com')
  .trim()
  .toLowerCase()
  .max(254, 'At most 254 characters');

const personName = text('Enter a name')
  .trim()
  .min(1, 'Enter a name')
  .max(120, 'At most 120 characters');

export const role = z.enum(USER_ROLES, { error: 'Choose a role' });

/** A new password: long enough; the common-password check runs on the server (a long list). */
export const newPassword = text('Enter a password')
  .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`)
  .max(MAX_PASSWORD_LENGTH, `At most ${MAX_PASSWORD_LENGTH} characters`);

/** Shop leads and technicians work at a shop; regional managers look after a region. */
export function scopeProblem(input: {
  role?: (typeof USER_ROLES)[number];
  shopId?: number | null;
  regionId?: number | null;
}): { field: 'shopId' | 'regionId'; message: string } | null {
  const { role: r, shopId, regionId } = input;
  if (r === 'shop_lead' || r === 'technician') {
    if (shopId == null) return { field: 'shopId', message: 'Choose the shop they work at' };
    if (regionId != null) return { field: 'regionId', message: 'A shop’s people have no region' };
  } else if (r === 'regional_manager') {
    if (regionId == null) return { field: 'regionId', message: 'Choose the region they manage' };
    if (shopId != null) return { field: 'shopId', message: 'A regional manager has no shop' };
  } else if (r) {
    if (shopId != null) return { field: 'shopId', message: 'This role works network-wide' };
    if (regionId != null) return { field: 'regionId', message: 'This role works network-wide' };
  }
  return null;
}

const withScope = <T extends z.ZodType<Parameters<typeof scopeProblem>[0]>>(schema: T) =>
  schema.superRefine((v, ctx) => {
    const problem = scopeProblem(v);
    if (problem) ctx.addIssue({ code: 'custom', path: [problem.field], message: problem.message });
  });

/** `POST /api/users`: invite a person by e-mail (they set their own password from the link). */
export const inviteInput = withScope(
  z.strictObject({
    name: personName,
    email,
    role,
    shopId: idNumber.nullable().optional(),
    regionId: idNumber.nullable().optional(),
  }),
);
export type InviteInput = z.infer<typeof inviteInput>;

/**
 * `PATCH /api/users/{id}`: any of name, role, shop, region and active. The role and its scope are
 * checked together against the person as they would be after the change.
 */
export const personPatch = z
  .strictObject({
    name: personName.optional(),
    role: role.optional(),
    shopId: idNumber.nullable().optional(),
    regionId: idNumber.nullable().optional(),
    active: z.boolean({ error: 'true or false' }).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, 'Change at least one field');
export type PersonPatch = z.infer<typeof personPatch>;

/** `POST /api/users/{id}/invite`: send a fresh invitation link, or withdraw the pending one. */
export const inviteAction = z.strictObject({
  action: z.enum(['resend', 'withdraw'], { error: 'resend or withdraw' }),
});
export type InviteAction = z.infer<typeof inviteAction>;

/** `GET /api/users?`: who to list. */
export const peopleQuery = z.strictObject({
  status: z
    .enum(['active', 'invited', 'deactivated'], { error: 'active, invited or deactivated' })
    .optional(),
});

/** The token in an e-mailed link: 32 random bytes, base64url (43 characters). */
export const linkToken = z
  .string({ error: 'The link is not complete' })
  .regex(/^[A-Za-z0-9_-]{43}$/, 'The link is not complete: open it from the e-mail again');

/** `POST /api/auth/password-reset`: ask for a reset link. */
export const passwordResetRequest = z.strictObject({ email });

/** `POST /api/auth/password-reset/confirm`: set a password from a reset or invitation link. */
export const passwordResetConfirm = z.strictObject({ token: linkToken, password: newPassword });
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirm>;

/** `PUT /api/me/password`: a signed-in person changes their own password. */
export const passwordChange = z
  .strictObject({
    currentPassword: text('Enter your current password')
      .min(1, 'Enter your current password')
      .max(MAX_PASSWORD_LENGTH),
    newPassword,
  })
  .refine((v) => v.currentPassword !== v.newPassword, {
    path: ['newPassword'],
    message: 'Choose a password different from the current one',
  });
export type PasswordChange = z.infer<typeof passwordChange>;
