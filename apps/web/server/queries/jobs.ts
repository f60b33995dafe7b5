import { and, asc, eq, inArray, sql } from '@reelwright/db';
import { customers, jobs, reels, users } from '@reelwright/db/schema';
import type { JobState } from '~/lib/labels';
import { OPEN_STATES } from '~/lib/jobs';
import { db } from '../db';
import type { Principal } from '../principal';
import { getShop } from './shops';

const BENCH_STATES: JobState[] = ['checked_in', 'on_bench', 'waiting_parts'];

export interface OpenJobRow {
  id: number;
  state: JobState;
  serviceType: string;
  checkedInAt: Date;
  promisedAt: Date | null;
  customerName: string;
  reel: string;
  technicianName: string | null;
}

/**
 * The shop's jobs not yet collected, oldest check-in first. The shop must be in the caller's scope
 * (404 otherwise); `technicianId` narrows to one technician's work, `benchOnly` leaves out reels
 * that are finished and only waiting for the customer.
 */
export async function oldestOpenJobs(
  principal: Principal,
  shopId: number,
  options: { technicianId?: number; limit?: number; benchOnly?: boolean } = {},
): Promise<OpenJobRow[]> {
  await getShop(principal, shopId);
  const conn = await db();
  const rows = await conn
    .select({
      id: jobs.id,
      state: jobs.state,
      serviceType: jobs.serviceType,
      checkedInAt: jobs.checkedInAt,
      promisedAt: jobs.promisedAt,
      customerName: customers.name,
      maker: reels.maker,
      model: reels.model,
      technicianName: users.name,
    })
    .from(jobs)
    .innerJoin(customers, eq(customers.id, jobs.customerId))
    .innerJoin(reels, eq(reels.id, jobs.reelId))
    .leftJoin(users, eq(users.id, jobs.technicianId))
    .where(
      and(
        eq(jobs.shopId, shopId),
        inArray(jobs.state, options.benchOnly ? BENCH_STATES : [...OPEN_STATES]),
        options.technicianId === undefined
          ? undefined
          : eq(jobs.technicianId, options.technicianId),
      ),
    )
    .orderBy(asc(jobs.checkedInAt), asc(jobs.id))
    .limit(options.limit ?? 10);
  return rows.map((r) => ({
    id: r.id,
    state: r.state,
    serviceType: r.serviceType,
    checkedInAt: r.checkedInAt,
    promisedAt: r.promisedAt,
    customerName: r.customerName,
    reel: `${r.maker} ${r.model}`,
    technicianName: r.technicianName,
  }));
}

/** How many of the shop's jobs are in each state, plus those that became ready in the last 30 days. */
export async function jobCounts(principal: Principal, shopId: number) {
  await getShop(principal, shopId);
  const conn = await db();
  const rows = await conn
    .select({ state: jobs.state, n: sql<number>`count(*)`.mapWith(Number) })
    .from(jobs)
    .where(eq(jobs.shopId, shopId))
    .groupBy(jobs.state);
  const byState = Object.fromEntries(rows.map((r) => [r.state, r.n])) as Partial<
    Record<JobState, number>
  >;
  const [recent] = await conn
    .select({ n: sql<number>`count(*)`.mapWith(Number) })
    .from(jobs)
    .where(and(eq(jobs.shopId, shopId), sql`${jobs.readyAt} >= now() - interval '30 days'`));
  return { byState, readyLast30Days: recent?.n ?? 0 };
}
