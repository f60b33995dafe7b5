import { eq } from '@reelwright/db';
import { activityLog, customers, shops, unsubscribeTokens } from '@reelwright/db/schema';
import { db } from '../db';

export interface UnsubscribeResult {
  shopName: string;
  /** True when this visit recorded the opt-out; false when it was already recorded. */
  changed: boolean;
}

/**
 * Records a customer's opt-out from service reminders from the token in their e-mail; no sign-in.
 * Visiting the link again changes nothing. Null for a token that does not exist.
 */
export async function unsubscribe(
  token: string,
  now = new Date(),
): Promise<UnsubscribeResult | null> {
  if (!/^[A-Za-z0-9_-]{16,128}$/.test(token)) return null;
  const conn = await db();
  return conn.transaction(async (tx) => {
    const [row] = await tx
      .select({
        tokenId: unsubscribeTokens.id,
        usedAt: unsubscribeTokens.usedAt,
        customerId: customers.id,
        consent: customers.reminderConsent,
        shopId: shops.id,
        shopName: shops.name,
      })
      .from(unsubscribeTokens)
      .innerJoin(customers, eq(customers.id, unsubscribeTokens.customerId))
      .innerJoin(shops, eq(shops.id, customers.shopId))
      .where(eq(unsubscribeTokens.token, token))
      .for('update', { of: [unsubscribeTokens, customers] });
    if (!row) return null;
    if (!row.usedAt)
      await tx
        .update(unsubscribeTokens)
        .set({ usedAt: now })
        .where(eq(unsubscribeTokens.id, row.tokenId));
    if (!row.consent) return { shopName: row.shopName, changed: false };
    await tx
      .update(customers)
      .set({ reminderConsent: false })
      .where(eq(customers.id, row.customerId));
    await tx.insert(activityLog).values({
      at: now,
      userId: null,
      action: 'customer.unsubscribe',
      entityType: 'customer',
      entityId: row.customerId,
      shopId: row.shopId,
      before: { reminderConsent: true },
      after: { reminderConsent: false },
    });
    return { shopName: row.shopName, changed: true };
  });
}
