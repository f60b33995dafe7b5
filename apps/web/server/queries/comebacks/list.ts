import { and, asc, desc, eq, inArray, sql } from '@reelwright/db';
import {
  comebacks,
  customers,
  reels,
  rootCauses,
  type ComebackAttribution,
} from '@reelwright/db/schema';
import type { ComebackListQuery, ComebackStatusValue } from '~/lib/validators/comebacks';
import { insideWindow } from '../../comebacks/detect';
import { loadComebackSettings } from '../../comebacks/settings';
import { db } from '../../db';
import { shopFilter } from '../scope';
import type { Principal } from '../../principal';
import {
  DAY,
  assignee,
  originalJob,
  originalShop,
  originalTech,
  reelLabel,
  returnJob,
  returnShop,
  reviewRights,
  reviewer,
  scopeShops,
} from './shared';
import * as clock from '~/server/clock';

export interface ComebackRow {
  id: number;
  status: ComebackStatusValue;
  detection: 'automatic' | 'manual';
  attribution: ComebackAttribution | null;
  rootCause: string | null;
  disposition: 'redone_free' | 'charged' | 'refunded' | null;
  symptom: string | null;
  daysSinceCollection: number;
  /** Inside the warranty window as it stands now (a manual link may be outside). */
  insideWindow: boolean;
  detectedAt: string;
  createdAt: string;
  reviewedAt: string | null;
  /** Whole days since the comeback was recorded (to its review, once reviewed). */
  ageDays: number;
  /** The review deadline: recorded + the review deadline in days. */
  dueAt: string;
  /** Open and past the review deadline. */
  overdue: boolean;
  reel: string;
  customerName: string;
  returnJob: { id: number; shopId: number; shopName: string; checkedInAt: string };
  originalJob: {
    id: number;
    shopId: number;
    shopName: string;
    timeZone: string;
    collectedAt: string | null;
    technicianName: string | null;
  };
  assignee: { id: number; name: string } | null;
  reviewerName: string | null;
  canReview: boolean;
}

export function baseQuery(conn: Awaited<ReturnType<typeof db>>) {
  return conn
    .select({
      cb: comebacks,
      returnJobId: returnJob.id,
      returnShopId: returnShop.id,
      returnShopName: returnShop.name,
      returnCheckedInAt: returnJob.checkedInAt,
      originalShopName: originalShop.name,
      originalRegionId: originalShop.regionId,
      originalTimeZone: originalShop.timeZone,
      originalCollectedAt: originalJob.collectedAt,
      originalTechName: originalTech.name,
      maker: reels.maker,
      model: reels.model,
      size: reels.size,
      customerName: customers.name,
      assigneeName: assignee.name,
      reviewerName: reviewer.name,
      rootCause: rootCauses.label,
    })
    .from(comebacks)
    .innerJoin(returnJob, eq(returnJob.id, comebacks.jobId))
    .innerJoin(returnShop, eq(returnShop.id, returnJob.shopId))
    .innerJoin(originalJob, eq(originalJob.id, comebacks.originalJobId))
    .innerJoin(originalShop, eq(originalShop.id, comebacks.originalShopId))
    .innerJoin(reels, eq(reels.id, returnJob.reelId))
    .innerJoin(customers, eq(customers.id, returnJob.customerId))
    .leftJoin(originalTech, eq(originalTech.id, originalJob.technicianId))
    .leftJoin(assignee, eq(assignee.id, comebacks.assigneeId))
    .leftJoin(reviewer, eq(reviewer.id, comebacks.reviewerId))
    .leftJoin(rootCauses, eq(rootCauses.id, comebacks.rootCauseId));
}

type BaseRow = Awaited<ReturnType<ReturnType<typeof baseQuery>['where']>>[number];

export function toRow(
  principal: Principal,
  r: BaseRow,
  settings: { reviewDeadlineDays: number; warrantyDays: number },
  now: Date,
): ComebackRow {
  const cb = r.cb;
  const until = cb.status === 'open' ? now : (cb.reviewedAt ?? now);
  const dueAt = new Date(cb.createdAt.getTime() + settings.reviewDeadlineDays * DAY);
  return {
    id: cb.id,
    status: cb.status,
    detection: cb.detection,
    attribution: cb.attribution,
    rootCause: r.rootCause,
    disposition: cb.disposition,
    symptom: cb.symptom,
    daysSinceCollection: cb.daysSinceCollection,
    insideWindow: r.originalCollectedAt
      ? insideWindow(r.originalCollectedAt, cb.detectedAt, settings.warrantyDays)
      : false,
    detectedAt: cb.detectedAt.toISOString(),
    createdAt: cb.createdAt.toISOString(),
    reviewedAt: cb.reviewedAt?.toISOString() ?? null,
    ageDays: Math.max(0, Math.floor((until.getTime() - cb.createdAt.getTime()) / DAY)),
    dueAt: dueAt.toISOString(),
    overdue: cb.status === 'open' && now.getTime() >= dueAt.getTime(),
    reel: reelLabel(r),
    customerName: r.customerName,
    returnJob: {
      id: r.returnJobId,
      shopId: r.returnShopId,
      shopName: r.returnShopName,
      checkedInAt: r.returnCheckedInAt.toISOString(),
    },
    originalJob: {
      id: cb.originalJobId,
      shopId: cb.originalShopId,
      shopName: r.originalShopName,
      timeZone: r.originalTimeZone,
      collectedAt: r.originalCollectedAt?.toISOString() ?? null,
      technicianName: r.originalTechName,
    },
    assignee:
      cb.assigneeId === null ? null : { id: cb.assigneeId, name: r.assigneeName ?? 'Unknown' },
    reviewerName: r.reviewerName,
    canReview: reviewRights(principal, {
      originalShopId: cb.originalShopId,
      originalRegionId: r.originalRegionId,
      assigneeId: cb.assigneeId,
    }).canReview,
  };
}

export interface ComebackList {
  comebacks: ComebackRow[];
  /** The shops whose queues the caller sees (the filter's choices). */
  shops: { id: number; name: string }[];
  settings: { reviewDeadlineDays: number; warrantyDays: number };
  counts: Record<ComebackStatusValue, number>;
  /** More matched than are listed (reviewed ones are cut to the latest). */
  truncated: boolean;
  asOf: string;
}

/** Most rows listed at once: open reviews are few; reviewed ones go back years. */
export const LIST_LIMIT = 300;

/**
 * `GET /api/comebacks`: the review queues of the caller's shops. A comeback belongs to the shop
 * that did the original work, wherever the reel came back. Open ones come first, oldest first
 * (the review clock starts when the comeback is recorded); reviewed ones follow, latest first.
 * A shop outside the caller's scope is not found.
 */
export async function listComebacks(
  principal: Principal,
  query: ComebackListQuery = {},
  now = clock.now(),
): Promise<ComebackList> {
  const conn = await db();
  const chosen = await shopFilter(principal, query.shop, conn);
  const inScope = await scopeShops(principal);
  const shopIds = chosen ? [chosen.id] : inScope.map((s) => s.id);
  const settings = await loadComebackSettings(conn);
  const byShop = shopIds.length ? inArray(comebacks.originalShopId, shopIds) : sql<boolean>`false`;
  const where = and(
    byShop,
    query.status === undefined ? undefined : eq(comebacks.status, query.status),
  );
  const [rows, countRows] = await Promise.all([
    baseQuery(conn)
      .where(where)
      .orderBy(
        sql`case when ${comebacks.status} = 'open' then 0 else 1 end`,
        sql`case when ${comebacks.status} = 'open' then ${comebacks.createdAt} end asc`,
        desc(sql`coalesce(${comebacks.reviewedAt}, ${comebacks.createdAt})`),
        asc(comebacks.id),
      )
      .limit(LIST_LIMIT + 1),
    conn
      .select({ status: comebacks.status, n: sql<number>`count(*)`.mapWith(Number) })
      .from(comebacks)
      .where(byShop)
      .groupBy(comebacks.status),
  ]);
  const counts = { open: 0, confirmed: 0, dismissed: 0 };
  for (const c of countRows) counts[c.status] = c.n;
  return {
    comebacks: rows.slice(0, LIST_LIMIT).map((r) => toRow(principal, r, settings, now)),
    shops: inScope.map((s) => ({ id: s.id, name: s.name })),
    settings: {
      reviewDeadlineDays: settings.reviewDeadlineDays,
      warrantyDays: settings.warrantyDays,
    },
    counts,
    truncated: rows.length > LIST_LIMIT,
    asOf: now.toISOString(),
  };
}
