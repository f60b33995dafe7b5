import { eq } from '@reelwright/db';
import { activityLog, customers, shops, unsubscribeTokens } from '@reelwright/db/schema';
import { UNSUBSCRIBE_TOKEN } from '~/lib/validators/reminders';
import { db } from '../db';
import * as clock from '~/server/clock';

export interface UnsubscribeResult {
  shopName: string;
  /** True when this visit recorded the opt-out; false when it was already recorded. */
  changed: boolean;
}

/**
 * What the unsubscribe page shows before anything changes: the shop and whether the customer
 * still gets reminders. Reading changes nothing, so a mail scanner that follows the link cannot
 * unsubscribe anyone. Null for a token that does not exist.
 */
export async function unsubscribeStatus(
  token: string,
): Promise<{ shopName: string; subscribed: boolean } | null> {
  if (!UNSUBSCRIBE_TOKEN.test(token)) return null;
  const conn = await db();
  const [row] = await conn
    .select({ shopName: shops.name, subscribed: customers.reminderConsent })
    .from(unsubscribeTokens)
    .innerJoin(customers, eq(customers.id, unsubscribeTokens.customerId))
    .innerJoin(shops, eq(shops.id, customers.shopId))
    .where(eq(unsubscribeTokens.token, token));
  return row ?? null;
}

/**
 * Records a customer's opt-out from service reminders from the token in their e-mail; no sign-in.
 * Confirming again changes nothing. Null for a token that does not exist.
 */
export async function unsubscribe(
  token: string,
  now = clock.now(),
): Promise<UnsubscribeResult | null> {
  if (!UNSUBSCRIBE_TOKEN.test(token)) return null;
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
