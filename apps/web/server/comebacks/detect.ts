import { and, desc, eq, isNotNull, lte, ne, type Tx } from '@reelwright/db';
import { comebacks, jobs, users, type Job } from '@reelwright/db/schema';
import type { ComebackLinkInput } from '~/lib/validators/comebacks';
import { lockJob, logActivity, pgError } from '../bench/shared';
import { db } from '../db';
import { badRequest, conflict, forbidden } from '../errors';
import type { Principal } from '../principal';
import { sameReelJobs } from './same-reel';
import { queueReviewEmails } from './notify';
import { loadComebackSettings } from './settings';
import * as clock from '~/server/clock';

const DAY = 86_400_000;

/** Whole days from the original job's collection to the return check-in. */
export const daysSince = (collectedAt: Date, checkedInAt: Date) =>
  Math.floor((checkedInAt.getTime() - collectedAt.getTime()) / DAY);

/**
 * Whether a return falls inside the warranty window. The window is half-open,
 * [collected, collected + warrantyDays × 24 h), exactly as @reelwright/metrics `comebackRate` and
 * the network comparison count it: a reel back at the very instant the window closes is outside,
 * so a flag is never raised for a return the figures would then leave out.
 */
export function insideWindow(collectedAt: Date, checkedInAt: Date, warrantyDays: number) {
  const lag = checkedInAt.getTime() - collectedAt.getTime();
  return lag >= 0 && lag < warrantyDays * DAY;
}

type ReturnJob = Pick<Job, 'id' | 'shopId' | 'reelId' | 'customerId' | 'checkedInAt'>;
type OriginalJob = Pick<Job, 'id' | 'shopId' | 'collectedAt'>;

/**
 * Records a comeback inside the caller's transaction: links the return job to the original,
 * opens the review for the shop that did the original work, logs both, and queues an e-mail with
 * the review's link to each of that shop's leads. Returns the comeback and how many e-mails wait.
 */
async function recordComeback(
  tx: Tx,
  args: {
    principal: Principal;
    job: ReturnJob;
    original: OriginalJob & { collectedAt: Date };
    detection: 'automatic' | 'manual';
    symptom: string | null;
    now: Date;
  },
) {
  const { principal, job, original, now } = args;
  const days = daysSince(original.collectedAt, job.checkedInAt);
  await tx
    .update(jobs)
    .set({ comebackOfJobId: original.id, updatedAt: now })
    .where(eq(jobs.id, job.id));
  const [created] = await tx
    .insert(comebacks)
    .values({
      jobId: job.id,
      originalJobId: original.id,
      originalShopId: original.shopId,
      status: 'open',
      detection: args.detection,
      symptom: args.symptom,
      // When the reel came back: the figures test this instant against the warranty window.
      detectedAt: job.checkedInAt,
      daysSinceCollection: days,
      createdAt: now,
      updatedAt: now,
    })
    .returning();
  const comeback = created!;
  const facts = {
    jobId: job.id,
    originalJobId: original.id,
    originalShopId: original.shopId,
    detection: args.detection,
    daysSinceCollection: days,
    symptom: args.symptom,
  };
  await logActivity(tx, {
    principal,
    action: args.detection === 'automatic' ? 'comeback.detect' : 'comeback.link',
    entityType: 'comeback',
    entityId: comeback.id,
    shopId: original.shopId,
    after: facts,
    at: now,
  });
  await logActivity(tx, {
    principal,
    action: 'job.comeback_of',
    entityType: 'job',
    entityId: job.id,
    shopId: job.shopId,
    before: { comebackOfJobId: null },
    after: { comebackOfJobId: original.id, comebackId: comeback.id },
    at: now,
  });

  const leads = await tx
    .select({ name: users.name, email: users.email })
    .from(users)
    .where(
      and(eq(users.shopId, original.shopId), eq(users.role, 'shop_lead'), eq(users.active, true)),
    );
  await queueReviewEmails(tx, comeback, leads);
  if (leads.length)
    await tx.update(comebacks).set({ notifiedAt: now }).where(eq(comebacks.id, comeback.id));
  return { comebackId: comeback.id, emailsQueued: leads.length };
}

/**
 * Detection at check-in, inside the check-in transaction: when the reel's most recently
 * collected job (at any shop of the network) was collected inside the warranty window before
 * this check-in, the new job is flagged as a comeback of it. Returns null when nothing is flagged.
 */
export async function detectAtCheckIn(
  tx: Tx,
  principal: Principal,
  job: ReturnJob & { complaint: string | null },
  now: Date,
) {
  const [previous] = await tx
    .select({ id: jobs.id, shopId: jobs.shopId, collectedAt: jobs.collectedAt })
    .from(jobs)
    .where(
      and(
        sameReelJobs(job.reelId),
        ne(jobs.id, job.id),
        isNotNull(jobs.collectedAt),
        lte(jobs.collectedAt, job.checkedInAt),
      ),
    )
    .orderBy(desc(jobs.collectedAt), desc(jobs.id))
    .limit(1);
  if (!previous?.collectedAt) return null;
  const { warrantyDays } = await loadComebackSettings(tx);
  if (!insideWindow(previous.collectedAt, job.checkedInAt, warrantyDays)) return null;
  return recordComeback(tx, {
    principal,
    job,
    original: { ...previous, collectedAt: previous.collectedAt },
    detection: 'automatic',
    symptom: job.complaint,
    now,
  });
}

/**
 * `POST /api/jobs/{id}/comeback-of`: a technician or lead of the return job's shop links it by
 * hand to an earlier job of the same reel (at any shop) collected before this check-in. Outside
 * the warranty window is allowed (the days are stored; the figures leave such a return out).
 * Already linked: 409.
 */
export async function linkComeback(
  principal: Principal,
  jobId: number,
  input: ComebackLinkInput,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  if (principal.scope.kind !== 'shop')
    throw forbidden('Only the people of the shop the reel came back to link it.');
  const conn = await db();
  try {
    return await conn.transaction(async (tx) => {
      const job = await lockJob(tx, principal, jobId);
      const [existing] = await tx
        .select({ id: comebacks.id })
        .from(comebacks)
        .where(eq(comebacks.jobId, job.id));
      if (job.comebackOfJobId !== null || existing)
        throw conflict(
          `Job #${job.id} is already linked as a comeback of job #${job.comebackOfJobId ?? '?'}.`,
        );
      const [original] = await tx
        .select({
          id: jobs.id,
          shopId: jobs.shopId,
          reelId: jobs.reelId,
          collectedAt: jobs.collectedAt,
        })
        .from(jobs)
        .where(and(eq(jobs.id, input.originalJobId), sameReelJobs(job.reelId)));
      if (!original || original.id === job.id)
        throw badRequest('Some body fields are not valid.', [
          { field: 'body.originalJobId', message: 'Choose an earlier job of this same reel' },
        ]);
      if (!original.collectedAt || original.collectedAt > job.checkedInAt)
        throw badRequest('Some body fields are not valid.', [
          {
            field: 'body.originalJobId',
            message: `Job #${original.id} was not collected before this reel was checked in`,
          },
        ]);
      return recordComeback(tx, {
        principal,
        job,
        original: { ...original, collectedAt: original.collectedAt },
        detection: 'manual',
        symptom: input.symptom ?? job.complaint,
        now,
      });
    });
  } catch (error) {
    // Two links at once: the unique index on the return job keeps only the first.
    if (pgError(error)?.code === '23505')
      throw conflict(`Job #${jobId} is already linked as a comeback.`);
    throw error;
  }
}
