import { eq, type Tx } from '@reelwright/db';
import { customers, jobs, reels, shops, type Comeback } from '@reelwright/db/schema';
import { queueEmail } from '../mail/outbox';
import { comebackReviewEmail } from './emails';
import { loadComebackSettings } from './settings';

/**
 * Queues the "a comeback to review" e-mail, with the review's link, to each recipient inside the
 * caller's transaction: the original shop's leads when it is found, the assignee when a manager
 * hands it on. Returns how many were queued.
 */
export async function queueReviewEmails(
  tx: Tx,
  comeback: Pick<
    Comeback,
    | 'id'
    | 'jobId'
    | 'originalJobId'
    | 'originalShopId'
    | 'daysSinceCollection'
    | 'symptom'
    | 'detection'
  >,
  recipients: readonly { name: string; email: string }[],
  options: { assignedBy?: string; baseUrl?: string | null } = {},
): Promise<number> {
  if (recipients.length === 0) return 0;
  const settings = await loadComebackSettings(tx);
  const [context] = await tx
    .select({
      returnShop: shops.name,
      customerName: customers.name,
      maker: reels.maker,
      model: reels.model,
      size: reels.size,
    })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .innerJoin(customers, eq(customers.id, jobs.customerId))
    .innerJoin(reels, eq(reels.id, jobs.reelId))
    .where(eq(jobs.id, comeback.jobId));
  const [originalShop] = await tx
    .select({ name: shops.name })
    .from(shops)
    .where(eq(shops.id, comeback.originalShopId));
  for (const person of recipients) {
    const message = comebackReviewEmail({
      recipientName: person.name,
      comebackId: comeback.id,
      originalShopName: originalShop!.name,
      returnShopName: context!.returnShop,
      returnJobId: comeback.jobId,
      originalJobId: comeback.originalJobId,
      reel: [context!.maker, context!.model, context!.size].filter(Boolean).join(' '),
      customerName: context!.customerName,
      daysSinceCollection: comeback.daysSinceCollection,
      symptom: comeback.symptom,
      detection: comeback.detection,
      reviewDeadlineDays: settings.reviewDeadlineDays,
      assignedBy: options.assignedBy,
      baseUrl: options.baseUrl,
    });
    await queueEmail(tx, {
      kind: 'comeback_review',
      to: person.email,
      ...message,
      jobId: comeback.jobId,
      shopId: comeback.originalShopId,
      entityType: 'comeback',
      entityId: comeback.id,
    });
  }
  return recipients.length;
}
