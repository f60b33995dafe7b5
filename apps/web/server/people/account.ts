import { and, eq, gte, sql } from '@reelwright/db';
import { accountLinks, activityLog, users } from '@reelwright/db/schema';
import type { PasswordChange, PasswordResetConfirm } from '~/lib/validators/people';
import { db } from '../db';
import { ApiError, badRequest, notFound } from '../errors';
import { queueEmail } from '../mail/outbox';
import type { Principal } from '../principal';
import { passwordResetEmail } from './emails';
import { hashToken, issueLink, linkUrl, withdrawLinks } from './links';
import { assertUncommon, hashPassword, passwordMatches } from './passwords';

/** At most this many reset e-mails to one account an hour, so the form cannot flood an inbox. */
export const RESETS_PER_HOUR = 3;

/**
 * `POST /api/auth/password-reset`: e-mails a one-time reset link when the address belongs to an
 * active account. The caller learns nothing either way: the answer is the same, and whether a
 * message was queued is only returned to the code (for the tests).
 */
export async function requestPasswordReset(
  email: string,
  options: { now?: Date } = {},
): Promise<{ queued: boolean }> {
  const now = options.now ?? new Date();
  return (await db()).transaction(async (tx) => {
    const [user] = await tx.select().from(users).where(eq(users.email, email)).for('update');
    if (!user || !user.active) return { queued: false };
    const [recent] = await tx
      .select({ n: sql<number>`count(*)::int` })
      .from(accountLinks)
      .where(
        and(
          eq(accountLinks.userId, user.id),
          eq(accountLinks.purpose, 'password_reset'),
          gte(accountLinks.createdAt, new Date(now.getTime() - 3_600_000)),
        ),
      );
    if ((recent?.n ?? 0) >= RESETS_PER_HOUR) return { queued: false };
    const { token, expiresAt } = await issueLink(tx, {
      userId: user.id,
      purpose: 'password_reset',
      createdById: null,
      now,
    });
    await queueEmail(tx, {
      kind: 'password_reset',
      to: user.email,
      ...passwordResetEmail({ name: user.name, link: linkUrl(token), expiresAt }),
      entityType: 'user',
      entityId: user.id,
    });
    await tx.insert(activityLog).values({
      at: now,
      userId: null,
      action: 'user.password_reset_request',
      entityType: 'user',
      entityId: user.id,
      shopId: user.shopId,
      after: { expiresAt },
    });
    return { queued: true };
  });
}

/** A link that is unknown, used, withdrawn or past its time: all the same answer. */
export const linkGone = () =>
  new ApiError(
    410,
    'link-gone',
    'This link no longer works',
    'The link has been used, withdrawn or has expired. Ask for a new one.',
  );

/** What a link is for, before its holder chooses a password (the set-password page). */
export async function describeLink(
  token: string,
  options: { now?: Date } = {},
): Promise<{ purpose: 'invitation' | 'password_reset'; name: string; email: string } | null> {
  const now = options.now ?? new Date();
  const [row] = await (
    await db()
  )
    .select({ link: accountLinks, name: users.name, email: users.email, active: users.active })
    .from(accountLinks)
    .innerJoin(users, eq(users.id, accountLinks.userId))
    .where(eq(accountLinks.tokenHash, hashToken(token)));
  if (!row || !usable(row.link, row.active, now)) return null;
  return { purpose: row.link.purpose, name: row.name, email: row.email };
}

const usable = (
  link: { usedAt: Date | null; withdrawnAt: Date | null; expiresAt: Date },
  active: boolean,
  now: Date,
) => active && !link.usedAt && !link.withdrawnAt && link.expiresAt > now;

/**
 * `POST /api/auth/password-reset/confirm`: sets the password of the link's person (an invitation
 * or a reset), once. Every other unused link of theirs stops working, and a new password ends
 * their sessions (the users trigger). Returns the e-mail to sign in with.
 */
export async function setPasswordFromLink(
  input: PasswordResetConfirm,
  options: { now?: Date } = {},
): Promise<{ email: string }> {
  const now = options.now ?? new Date();
  assertUncommon(input.password, 'body.password');
  const passwordHash = await hashPassword(input.password);
  return (await db()).transaction(async (tx) => {
    const [link] = await tx
      .select()
      .from(accountLinks)
      .where(eq(accountLinks.tokenHash, hashToken(input.token)))
      .for('update');
    if (!link) throw linkGone();
    const [user] = await tx.select().from(users).where(eq(users.id, link.userId)).for('update');
    if (!user || !usable(link, user.active, now)) throw linkGone();
    await tx.update(accountLinks).set({ usedAt: now }).where(eq(accountLinks.id, link.id));
    await withdrawLinks(tx, user.id, null, now);
    await tx.update(users).set({ passwordHash }).where(eq(users.id, user.id));
    await tx.insert(activityLog).values({
      at: now,
      userId: user.id,
      action: link.purpose === 'invitation' ? 'user.invite_accept' : 'user.password_reset',
      entityType: 'user',
      entityId: user.id,
      shopId: user.shopId,
    });
    return { email: user.email };
  });
}

/**
 * `PUT /api/me/password`: the signed-in person changes their password, giving the current one.
 * Every session of theirs ends, this one too: they sign in again with the new password.
 */
export async function changeOwnPassword(
  principal: Principal,
  input: PasswordChange,
  options: { now?: Date } = {},
): Promise<{ changed: true }> {
  const now = options.now ?? new Date();
  const conn = await db();
  const [user] = await conn.select().from(users).where(eq(users.id, principal.id));
  if (!user) throw notFound('account');
  if (!(await passwordMatches(user.passwordHash, input.currentPassword)))
    throw badRequest('Some body fields are not valid.', [
      { field: 'body.currentPassword', message: 'This is not your current password' },
    ]);
  assertUncommon(input.newPassword, 'body.newPassword');
  const passwordHash = await hashPassword(input.newPassword);
  await conn.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash }).where(eq(users.id, principal.id));
    await tx.insert(activityLog).values({
      at: now,
      userId: principal.id,
      action: 'user.password_change',
      entityType: 'user',
      entityId: principal.id,
      shopId: user.shopId,
    });
  });
  return { changed: true };
}
