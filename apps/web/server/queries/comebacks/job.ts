import { and, asc, desc, eq, isNotNull, lte, ne } from '@reelwright/db';
import { comebacks, jobs, shops, type ComebackAttribution } from '@reelwright/db/schema';
import { can } from '~/lib/permissions';
import type { ComebackStatusValue } from '~/lib/validators/comebacks';
import { jobScope } from '../../bench/shared';
import { insideWindow } from '../../comebacks/detect';
import { loadComebackSettings } from '../../comebacks/settings';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { sameReelJobs } from '../../comebacks/same-reel';
import { DAY, originalJob, returnJob, scopeShops } from './shared';

export interface JobComeback {
  /** This job as a return of an earlier one. */
  comeback: {
    id: number;
    status: ComebackStatusValue;
    detection: 'automatic' | 'manual';
    attribution: ComebackAttribution | null;
    daysSinceCollection: number;
    insideWindow: boolean;
    originalJob: { id: number; shopName: string; collectedAt: string | null; visible: boolean };
  } | null;
  /** Later returns of this job's work. */
  returns: { id: number; jobId: number; status: ComebackStatusValue; shopName: string }[];
  /** The reel's earlier collected jobs, latest first: what a manual link may point at. */
  candidates: {
    id: number;
    shopName: string;
    serviceType: string;
    collectedAt: string;
    daysBefore: number;
    insideWindow: boolean;
    visible: boolean;
  }[];
  canReadReview: boolean;
  canLink: boolean;
  warrantyDays: number;
}

/** `GET /api/jobs/{id}/comeback-of`: what the job page shows about comebacks; 404 outside scope. */
export async function jobComeback(principal: Principal, jobId: number): Promise<JobComeback> {
  const conn = await db();
  const [job] = await conn
    .select()
    .from(jobs)
    .where(and(eq(jobs.id, jobId), jobScope(principal)));
  if (!job) throw notFound('job');
  const inScope = new Set((await scopeShops(principal)).map((s) => s.id));
  const settings = await loadComebackSettings(conn);
  const [linked, returns, earlier] = await Promise.all([
    conn
      .select({
        cb: comebacks,
        shopName: shops.name,
        collectedAt: originalJob.collectedAt,
        shopId: originalJob.shopId,
      })
      .from(comebacks)
      .innerJoin(originalJob, eq(originalJob.id, comebacks.originalJobId))
      .innerJoin(shops, eq(shops.id, originalJob.shopId))
      .where(eq(comebacks.jobId, jobId)),
    conn
      .select({
        id: comebacks.id,
        jobId: comebacks.jobId,
        status: comebacks.status,
        shopName: shops.name,
      })
      .from(comebacks)
      .innerJoin(returnJob, eq(returnJob.id, comebacks.jobId))
      .innerJoin(shops, eq(shops.id, returnJob.shopId))
      .where(eq(comebacks.originalJobId, jobId))
      .orderBy(asc(comebacks.detectedAt)),
    conn
      .select({
        id: jobs.id,
        shopId: jobs.shopId,
        shopName: shops.name,
        serviceType: jobs.serviceType,
        collectedAt: jobs.collectedAt,
      })
      .from(jobs)
      .innerJoin(shops, eq(shops.id, jobs.shopId))
      .where(
        and(
          sameReelJobs(job.reelId),
          ne(jobs.id, job.id),
          isNotNull(jobs.collectedAt),
          lte(jobs.collectedAt, job.checkedInAt),
        ),
      )
      .orderBy(desc(jobs.collectedAt), desc(jobs.id))
      .limit(12),
  ]);
  const l = linked[0];
  const linkedComeback = l
    ? {
        id: l.cb.id,
        status: l.cb.status,
        detection: l.cb.detection,
        attribution: l.cb.attribution,
        daysSinceCollection: l.cb.daysSinceCollection,
        insideWindow: l.collectedAt
          ? insideWindow(l.collectedAt, l.cb.detectedAt, settings.warrantyDays)
          : false,
        originalJob: {
          id: l.cb.originalJobId,
          shopName: l.shopName,
          collectedAt: l.collectedAt?.toISOString() ?? null,
          visible: inScope.has(l.shopId),
        },
      }
    : null;
  const bench = principal.scope.kind === 'shop' && principal.scope.shopId === job.shopId;
  return {
    comeback: linkedComeback,
    returns,
    candidates: earlier.map((e) => ({
      id: e.id,
      shopName: e.shopName,
      serviceType: e.serviceType,
      collectedAt: e.collectedAt!.toISOString(),
      daysBefore: Math.floor((job.checkedInAt.getTime() - e.collectedAt!.getTime()) / DAY),
      insideWindow: insideWindow(e.collectedAt!, job.checkedInAt, settings.warrantyDays),
      visible: inScope.has(e.shopId),
    })),
    canReadReview: can(principal.role, 'comebacks:read'),
    canLink:
      can(principal.role, 'jobs:write') &&
      bench &&
      linkedComeback === null &&
      job.comebackOfJobId === null &&
      earlier.length > 0,
    warrantyDays: settings.warrantyDays,
  };
}
