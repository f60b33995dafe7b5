import { createHash, randomBytes } from 'node:crypto';
import { and, eq, isNull, type Tx } from '@reelwright/db';
import { accountLinks, type AccountLinkPurpose } from '@reelwright/db/schema';
import { env } from '~/env';

// One-time links e-mailed to a person. Their expiry is protocol timing, so it runs on the wall
// clock (as session expiry does), not on the business clock; tests pass `now`.

/** How long a link works after it is sent. */
export const LINK_LIFETIME_MS: Record<AccountLinkPurpose, number> = {
  invitation: 7 * 24 * 3_600_000,
  password_reset: 60 * 60_000,
};

/** The stored form of a token: only its SHA-256, so a read of the table opens no account. */
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/**
 * Withdraws the person's unused links of this purpose and makes a new one; returns the token for
 * the e-mail (it is never stored).
 */
export async function issueLink(
  tx: Tx,
  input: { userId: number; purpose: AccountLinkPurpose; createdById: number | null; now: Date },
): Promise<{ token: string; expiresAt: Date }> {
  await withdrawLinks(tx, input.userId, input.purpose, input.now);
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(input.now.getTime() + LINK_LIFETIME_MS[input.purpose]);
  await tx.insert(accountLinks).values({
    userId: input.userId,
    purpose: input.purpose,
    tokenHash: hashToken(token),
    createdById: input.createdById,
    createdAt: input.now,
    expiresAt,
  });
  return { token, expiresAt };
}

/** Marks the person's unused links (of one purpose, or all) as withdrawn; returns how many. */
export async function withdrawLinks(
  tx: Tx,
  userId: number,
  purpose: AccountLinkPurpose | null,
  now: Date,
): Promise<number> {
  const rows = await tx
    .update(accountLinks)
    .set({ withdrawnAt: now })
    .where(
      and(
        eq(accountLinks.userId, userId),
        purpose ? eq(accountLinks.purpose, purpose) : undefined,
        isNull(accountLinks.usedAt),
        isNull(accountLinks.withdrawnAt),
      ),
    )
    .returning({ id: accountLinks.id });
  return rows.length;
}

/** The app's public address for links in e-mail: APP_BASE_URL, else NEXTAUTH_URL. */
export function linkUrl(token: string): string {
  const path = `/set-password?token=${token}`;
  const base = env.APP_BASE_URL ?? env.NEXTAUTH_URL;
  return base ? new URL(path, base).href : path;
}
