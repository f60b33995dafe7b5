import { and, eq, inArray, sql, type SQL, type Tx } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  jobs,
  partLines,
  servicePrices,
  shops,
  type Job,
} from '@reelwright/db/schema';
import type { Principal } from '../principal';
import { notFound } from '../errors';
import { conflict } from '../errors';
import * as clock from '~/server/clock';

/** Jobs inside the caller's shops (undefined: the whole network). */
export function jobScope(principal: Principal): SQL | undefined {
  switch (principal.scope.kind) {
    case 'network':
      return undefined;
    case 'region':
      return inArray(
        jobs.shopId,
        sql`(select ${shops.id} from ${shops} where ${shops.regionId} = ${principal.scope.regionId})`,
      );
    case 'shop':
      return eq(jobs.shopId, principal.scope.shopId);
    case 'rounds':
      // An auditor reads jobs only as samples of their rounds, never as bench work.
      return sql`false`;
  }
}

/** The job, locked for the rest of the transaction; 404 when it is outside the caller's shops. */
export async function lockJob(tx: Tx, principal: Principal, id: number): Promise<Job> {
  const [job] = await tx
    .select()
    .from(jobs)
    .where(and(eq(jobs.id, id), jobScope(principal)))
    .for('update');
  if (!job) throw notFound('job');
  return job;
}

/** Collected jobs are closed: their money and record feed the month close. */
export function assertOpen(job: Job) {
  if (job.state === 'collected')
    throw conflict(`Job #${job.id} has been collected; its record can no longer be changed.`);
}

export async function logActivity(
  tx: Tx,
  entry: {
    principal: Principal;
    action: string;
    entityType: string;
    entityId: number;
    shopId: number;
    before?: Record<string, unknown> | null;
    after?: Record<string, unknown> | null;
    at?: Date;
  },
) {
  await tx.insert(activityLog).values({
    at: entry.at ?? clock.now(),
    userId: entry.principal.id,
    action: entry.action,
    entityType: entry.entityType,
    entityId: entry.entityId,
    shopId: entry.shopId,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}

/** Bench time × the posted rate, to the nearest cent. */
export const benchChargeCents = (minutes: number, rateCents: number) =>
  Math.round((minutes * rateCents) / 60);

export async function labourRate(tx: Tx, shopId: number) {
  const [shop] = await tx
    .select({ labourRateCents: shops.labourRateCents })
    .from(shops)
    .where(eq(shops.id, shopId));
  return shop?.labourRateCents ?? 0;
}

export async function flatPrice(tx: Tx, shopId: number, serviceType: Job['serviceType']) {
  const [row] = await tx
    .select({ cents: servicePrices.flatPriceCents })
    .from(servicePrices)
    .where(and(eq(servicePrices.shopId, shopId), eq(servicePrices.serviceType, serviceType)));
  return row?.cents ?? null;
}

/**
 * Brings the job's derived money and time in line with its rows: partsCents from the part lines,
 * benchMinutes from the bench sessions, labour too when it was following bench time (equal to the
 * bench charge before this change), and the discount no larger than labour + parts.
 */
export async function syncTotals(tx: Tx, job: Job) {
  const [parts] = await tx
    .select({
      cents:
        sql<number>`coalesce(sum(${partLines.quantity} * ${partLines.unitPriceCents}), 0)`.mapWith(
          Number,
        ),
    })
    .from(partLines)
    .where(eq(partLines.jobId, job.id));
  const [time] = await tx
    .select({
      n: sql<number>`count(${benchSessions.minutes})`.mapWith(Number),
      minutes: sql<number>`coalesce(sum(${benchSessions.minutes}), 0)`.mapWith(Number),
    })
    .from(benchSessions)
    .where(eq(benchSessions.jobId, job.id));
  const rate = await labourRate(tx, job.shopId);
  const benchMinutes = time && time.n > 0 ? time.minutes : null;
  const followsBenchTime = job.labourCents === benchChargeCents(job.benchMinutes ?? 0, rate);
  const labourCents = followsBenchTime
    ? benchChargeCents(benchMinutes ?? 0, rate)
    : job.labourCents;
  const partsCents = parts?.cents ?? 0;
  const discountCents = Math.min(job.discountCents, labourCents + partsCents);
  const [updated] = await tx
    .update(jobs)
    .set({ partsCents, benchMinutes, labourCents, discountCents })
    .where(eq(jobs.id, job.id))
    .returning();
  return updated!;
}

/** The PostgreSQL error under a driver or Drizzle wrapper, if any. */
export function pgError(error: unknown): { code?: string; constraint?: string } | undefined {
  let e: unknown = error;
  for (let depth = 0; depth < 4 && e && typeof e === 'object'; depth++) {
    const o = e as { code?: unknown; constraint?: unknown; cause?: unknown };
    if (typeof o.code === 'string' && /^[0-9A-Z]{5}$/.test(o.code))
      return {
        code: o.code,
        constraint: typeof o.constraint === 'string' ? o.constraint : undefined,
      };
    e = o.cause;
  }
  return undefined;
}
