import {
  aliasedTable,
  and,
  asc,
  desc,
  eq,
  inArray,
  isNotNull,
  lte,
  ne,
  or,
  sql,
  type SQL,
  type Tx,
} from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  checklistTicks,
  comebacks,
  correctiveActions,
  customers,
  jobs,
  partLines,
  reels,
  rootCauses,
  serviceStandardSteps,
  shops,
  users,
  type ComebackAttribution,
} from '@reelwright/db/schema';
import { can } from '~/lib/permissions';
import {
  parseDismissal,
  type ComebackListQuery,
  type ComebackStatusValue,
  type DismissReasonValue,
} from '~/lib/validators/comebacks';
import type { PeriodQuery } from '~/lib/validators/network';
import { addDays, localToday } from '../audits/sampling';
import { benchChargeCents, jobScope } from '../bench/shared';
import { insideWindow } from '../comebacks/detect';
import { listRootCauses, loadComebackSettings } from '../comebacks/settings';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { applicableSteps } from './bench';
import { sameReelJobs } from '../comebacks/same-reel';
import { shopScope } from './scope';

const DAY = 86_400_000;

const returnJob = aliasedTable(jobs, 'return_job');
const originalJob = aliasedTable(jobs, 'original_job');
const returnShop = aliasedTable(shops, 'return_shop');
const originalShop = aliasedTable(shops, 'original_shop');
const assignee = aliasedTable(users, 'assignee');
const reviewer = aliasedTable(users, 'reviewer');
const originalTech = aliasedTable(users, 'original_tech');

/** The shops in the caller's scope, with their region. */
async function scopeShops(principal: Principal) {
  const conn = await db();
  return conn
    .select({ id: shops.id, name: shops.name, regionId: shops.regionId, timeZone: shops.timeZone })
    .from(shops)
    .where(shopScope(principal))
    .orderBy(asc(shops.name));
}

export interface ReviewRights {
  /** May confirm, dismiss and attribute: the original shop's lead or the assignee, or a manager or the owner in scope. */
  canReview: boolean;
  /** May hand the review to another person: a regional manager or the owner in scope. */
  canReassign: boolean;
}

/** Who may review a comeback: never decided by the request, always from the role and scope. */
export function reviewRights(
  principal: Principal,
  comeback: { originalShopId: number; originalRegionId: number; assigneeId: number | null },
): ReviewRights {
  if (!can(principal.role, 'comebacks:review')) return { canReview: false, canReassign: false };
  const scope = principal.scope;
  const managerInScope =
    (principal.role === 'owner' && scope.kind === 'network') ||
    (principal.role === 'regional_manager' &&
      scope.kind === 'region' &&
      scope.regionId === comeback.originalRegionId);
  const lead =
    principal.role === 'shop_lead' &&
    scope.kind === 'shop' &&
    (scope.shopId === comeback.originalShopId || comeback.assigneeId === principal.id);
  return { canReview: managerInScope || lead, canReassign: managerInScope };
}

const reelLabel = (r: { maker: string; model: string; size: string | null }) =>
  [r.maker, r.model, r.size].filter(Boolean).join(' ');

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

function baseQuery(conn: Awaited<ReturnType<typeof db>>) {
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

function toRow(
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
  now = new Date(),
): Promise<ComebackList> {
  const conn = await db();
  const inScope = await scopeShops(principal);
  if (query.shop !== undefined && !inScope.some((s) => s.id === query.shop)) throw notFound('shop');
  const shopIds = query.shop !== undefined ? [query.shop] : inScope.map((s) => s.id);
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

export interface JobFacts {
  id: number;
  shop: { id: number; name: string; timeZone: string; labourRateCents: number };
  /** Whether the caller can open the job's page (inside their shops). */
  visible: boolean;
  state: string;
  serviceType: string;
  technicianName: string | null;
  checkedInAt: string;
  readyAt: string | null;
  collectedAt: string | null;
  complaint: string | null;
  findings: string | null;
  incompleteChecklistReason: string | null;
  benchMinutes: number;
  labourCents: number;
  partsCents: number;
  discountCents: number;
}

export interface ComebackDetail extends ComebackRow {
  dismissal: { reason: DismissReasonValue | null; note: string | null; text: string | null };
  rootCauseId: number | null;
  rootCauseNote: string | null;
  checklistStepId: number | null;
  checklistStep: { id: number; code: string; title: string } | null;
  redoCostCents: number | null;
  notifiedAt: string | null;
  reel: string;
  reelKind: string;
  returnDetail: JobFacts;
  originalDetail: JobFacts;
  /** The return job's bench time and parts, priced: what the redo cost. */
  redo: {
    benchMinutes: number;
    labourRateCents: number;
    labourCents: number;
    parts: { name: string; quantity: number; unitPriceCents: number; lineCents: number }[];
    partsCents: number;
    totalCents: number;
  };
  /** The original job's checklist steps (its standard, its reel kind) and whether each was ticked. */
  steps: { id: number; code: string; title: string; group: string; ticked: boolean }[];
  rootCauses: { id: number; label: string; active: boolean }[];
  /** People the review can be handed to: the original shop's leads, its regional manager, the owner. */
  reviewers: { id: number; name: string; role: string }[];
  /** People who can own a corrective action: the original shop's leads and technicians. */
  actionOwners: { id: number; name: string; role: string }[];
  correctiveActions: {
    id: number;
    title: string;
    status: string;
    dueOn: string;
    owner: string | null;
  }[];
  history: { id: number; at: string; action: string; userName: string | null; after: unknown }[];
  settings: {
    warrantyDays: number;
    reviewDeadlineDays: number;
    correctiveActionDueDays: number;
    countedAttributions: ComebackAttribution[];
    /** Today + the corrective-action due days, in the original shop's zone. */
    defaultDueOn: string;
  };
  canReassign: boolean;
  canOpenAction: boolean;
}

async function jobFacts(id: number, visibleShopIds: Set<number>): Promise<JobFacts> {
  const conn = await db();
  const [row] = await conn
    .select({ job: jobs, shop: shops, tech: users.name })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .leftJoin(users, eq(users.id, jobs.technicianId))
    .where(eq(jobs.id, id));
  if (!row) throw notFound('job');
  const j = row.job;
  return {
    id: j.id,
    shop: {
      id: row.shop.id,
      name: row.shop.name,
      timeZone: row.shop.timeZone,
      labourRateCents: row.shop.labourRateCents,
    },
    visible: visibleShopIds.has(row.shop.id),
    state: j.state,
    serviceType: j.serviceType,
    technicianName: row.tech,
    checkedInAt: j.checkedInAt.toISOString(),
    readyAt: j.readyAt?.toISOString() ?? null,
    collectedAt: j.collectedAt?.toISOString() ?? null,
    complaint: j.complaint,
    findings: j.findings,
    incompleteChecklistReason: j.incompleteChecklistReason,
    benchMinutes: j.benchMinutes ?? 0,
    labourCents: j.labourCents,
    partsCents: j.partsCents,
    discountCents: j.discountCents,
  };
}

/**
 * The cost of the redo: the return job's logged bench time at its shop's posted labour rate
 * (to the nearest cent, as the bench prices time) plus its parts at their recorded prices.
 */
export async function redoCost(returnJobId: number, tx?: Pick<Tx, 'select'>) {
  const conn = tx ?? (await db());
  const [row] = await conn
    .select({ minutes: jobs.benchMinutes, rate: shops.labourRateCents })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .where(eq(jobs.id, returnJobId));
  const [sessions] = await conn
    .select({ minutes: sql<number>`coalesce(sum(${benchSessions.minutes}), 0)`.mapWith(Number) })
    .from(benchSessions)
    .where(eq(benchSessions.jobId, returnJobId));
  const parts = await conn
    .select({
      name: partLines.name,
      quantity: partLines.quantity,
      unitPriceCents: partLines.unitPriceCents,
    })
    .from(partLines)
    .where(eq(partLines.jobId, returnJobId))
    .orderBy(asc(partLines.createdAt), asc(partLines.id));
  // Logged sessions are the record; an imported job may carry only its total.
  const benchMinutes = sessions && sessions.minutes > 0 ? sessions.minutes : (row?.minutes ?? 0);
  const labourRateCents = row?.rate ?? 0;
  const labourCents = benchChargeCents(benchMinutes, labourRateCents);
  const lines = parts.map((p) => ({ ...p, lineCents: p.quantity * p.unitPriceCents }));
  const partsCents = lines.reduce((sum, p) => sum + p.lineCents, 0);
  return {
    benchMinutes,
    labourRateCents,
    labourCents,
    parts: lines,
    partsCents,
    totalCents: labourCents + partsCents,
  };
}

/** Where the caller may read a comeback: its original shop or the shop the reel came back to. */
function readScope(shopIds: number[]): SQL {
  if (shopIds.length === 0) return sql`false`;
  return or(inArray(comebacks.originalShopId, shopIds), inArray(returnJob.shopId, shopIds))!;
}

/**
 * `GET /api/comebacks/{id}`: the review with both jobs side by side, the redo cost and how it is
 * made up, the choices the form offers and the review's history. The original shop and the shop
 * the reel came back to can read it; anyone else gets 404.
 */
export async function getComeback(
  principal: Principal,
  id: number,
  now = new Date(),
): Promise<ComebackDetail> {
  const conn = await db();
  const inScope = await scopeShops(principal);
  const visible = new Set(inScope.map((s) => s.id));
  const [row] = await baseQuery(conn).where(and(eq(comebacks.id, id), readScope([...visible])));
  if (!row) throw notFound('comeback');
  const settings = await loadComebackSettings(conn);
  const base = toRow(principal, row, settings, now);
  const cb = row.cb;
  const rights = reviewRights(principal, {
    originalShopId: cb.originalShopId,
    originalRegionId: row.originalRegionId,
    assigneeId: cb.assigneeId,
  });
  const [returnDetail, originalDetail, redo, causes, reelRow] = await Promise.all([
    jobFacts(cb.jobId, visible),
    jobFacts(cb.originalJobId, visible),
    redoCost(cb.jobId),
    listRootCauses(conn),
    conn
      .select({ kind: reels.kind, standardId: originalJob.serviceStandardId })
      .from(originalJob)
      .innerJoin(reels, eq(reels.id, originalJob.reelId))
      .where(eq(originalJob.id, cb.originalJobId)),
  ]);
  const kind = reelRow[0]?.kind ?? 'spinning';
  const [steps, ticks, people, actions, history] = await Promise.all([
    applicableSteps(reelRow[0]?.standardId ?? null, kind, conn),
    conn
      .select({ stepId: checklistTicks.stepId })
      .from(checklistTicks)
      .where(eq(checklistTicks.jobId, cb.originalJobId)),
    conn
      .select({
        id: users.id,
        name: users.name,
        role: users.role,
        shopId: users.shopId,
        regionId: users.regionId,
      })
      .from(users)
      .where(
        and(
          eq(users.active, true),
          or(
            eq(users.shopId, cb.originalShopId),
            eq(users.regionId, row.originalRegionId),
            eq(users.role, 'owner'),
          ),
        ),
      )
      .orderBy(asc(users.name)),
    conn
      .select({
        id: correctiveActions.id,
        title: correctiveActions.title,
        status: correctiveActions.status,
        dueOn: correctiveActions.dueOn,
        owner: users.name,
      })
      .from(correctiveActions)
      .leftJoin(users, eq(users.id, correctiveActions.ownerId))
      .where(eq(correctiveActions.comebackId, id))
      .orderBy(asc(correctiveActions.id)),
    conn
      .select({
        id: activityLog.id,
        at: activityLog.at,
        action: activityLog.action,
        userName: users.name,
        after: activityLog.after,
      })
      .from(activityLog)
      .leftJoin(users, eq(users.id, activityLog.userId))
      .where(and(eq(activityLog.entityType, 'comeback'), eq(activityLog.entityId, id)))
      .orderBy(asc(activityLog.at), asc(activityLog.id)),
  ]);
  const ticked = new Set(ticks.map((t) => t.stepId));
  let step = steps.find((s) => s.id === cb.checklistStepId);
  if (!step && cb.checklistStepId !== null) {
    // A step of another standard version: still named, though not offered.
    [step] = await conn
      .select()
      .from(serviceStandardSteps)
      .where(eq(serviceStandardSteps.id, cb.checklistStepId));
  }
  const leadsAndTechs = people.filter(
    (p) => p.shopId === cb.originalShopId && (p.role === 'shop_lead' || p.role === 'technician'),
  );
  return {
    ...base,
    canReview: rights.canReview,
    canReassign: rights.canReassign,
    canOpenAction: rights.canReview && can(principal.role, 'corrective-actions:manage'),
    dismissal: { ...parseDismissal(cb.dismissReason), text: cb.dismissReason },
    rootCauseId: cb.rootCauseId,
    rootCauseNote: cb.rootCauseNote,
    checklistStepId: cb.checklistStepId,
    checklistStep: step ? { id: step.id, code: step.code, title: step.title } : null,
    redoCostCents: cb.redoCostCents,
    notifiedAt: cb.notifiedAt?.toISOString() ?? null,
    reelKind: kind,
    returnDetail,
    originalDetail,
    redo,
    steps: steps.map((s) => ({
      id: s.id,
      code: s.code,
      title: s.title,
      group: s.group,
      ticked: ticked.has(s.id),
    })),
    rootCauses: causes
      .filter((c) => c.active || c.id === cb.rootCauseId)
      .map((c) => ({ id: c.id, label: c.label, active: c.active })),
    reviewers: people
      .filter(
        (p) =>
          (p.role === 'shop_lead' && p.shopId === cb.originalShopId) ||
          p.role === 'regional_manager' ||
          p.role === 'owner',
      )
      .map((p) => ({ id: p.id, name: p.name, role: p.role })),
    actionOwners: leadsAndTechs.map((p) => ({ id: p.id, name: p.name, role: p.role })),
    correctiveActions: actions,
    history: history.map((h) => ({ ...h, at: h.at.toISOString() })),
    settings: {
      ...settings,
      defaultDueOn: addDays(
        localToday(row.originalTimeZone, now),
        settings.correctiveActionDueDays,
      ),
    },
  };
}

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

export interface BreakdownRow {
  key: string;
  label: string;
  confirmed: number;
  /** Of them, with an attribution that counts in the comeback rate. */
  counted: number;
}

export interface ComebackBreakdown {
  period: PeriodQuery;
  confirmed: number;
  counted: number;
  countedAttributions: ComebackAttribution[];
  warrantyDays: number;
  byRootCause: BreakdownRow[];
  byStep: BreakdownRow[];
  /** Null when the caller may not see it (technicians). */
  byTechnician: (BreakdownRow & { collected: number })[] | null;
}

/**
 * The period's confirmed comebacks of one shop, as the shop page's comeback rate counts them:
 * jobs of the shop collected in the period (in its zone, by `asOf`) that came back inside the
 * warranty window; split by root cause, by the checklist step they trace to (by step code, so
 * versions of the standard add up), and by the original job's technician for the shop lead,
 * regional manager and owner. Outside the scope: not found.
 */
export async function comebackBreakdown(
  principal: Principal,
  shopId: number,
  period: PeriodQuery,
  asOf = new Date(),
): Promise<ComebackBreakdown> {
  const conn = await db();
  const [shop] = await conn
    .select({ id: shops.id })
    .from(shops)
    .where(and(eq(shops.id, shopId), shopScope(principal)));
  if (!shop) throw notFound('shop');
  const settings = await loadComebackSettings(conn);
  const hours = settings.warrantyDays * 24;
  const at = asOf.toISOString();
  const counted = `{${settings.countedAttributions.join(',')}}`;
  type Row = {
    dim: string;
    key: string | null;
    label: string | null;
    confirmed: number;
    counted: number;
  };
  const { rows } = await conn.execute<Row>(sql`
    with s as (
      select x.id,
        (${period.from}::date::timestamp at time zone x.time_zone) as t0,
        ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
      from shops x where x.id = ${shopId}
    ),
    c as (
      select cb.id, cb.attribution = any(${counted}::comeback_attribution[]) as counted,
        rc.code as cause_code, rc.label as cause_label,
        st.code as step_code, st.title as step_title,
        j.technician_id::text as tech_id, u.name as tech_name
      from s
      join jobs j on j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1
        and j.collected_at <= ${at}::timestamptz
      join comebacks cb on cb.original_job_id = j.id and cb.original_shop_id = s.id
        and cb.status = 'confirmed' and cb.detected_at <= ${at}::timestamptz
        and cb.detected_at >= j.collected_at
        and cb.detected_at < j.collected_at + ${hours} * interval '1 hour'
      left join root_causes rc on rc.id = cb.root_cause_id
      left join service_standard_steps st on st.id = cb.checklist_step_id
      left join users u on u.id = j.technician_id
    )
    select 'cause' as dim, cause_code as key, min(cause_label) as label,
      count(*)::int as confirmed, (count(*) filter (where counted))::int as counted
    from c group by cause_code
    union all
    select 'step', step_code, min(step_title), count(*)::int, (count(*) filter (where counted))::int
    from c group by step_code
    union all
    select 'tech', tech_id, min(tech_name), count(*)::int, (count(*) filter (where counted))::int
    from c group by tech_id`);
  const seeTechnicians = principal.role !== 'technician';
  const collectedByTech = seeTechnicians
    ? (
        await conn.execute<{ key: string | null; label: string | null; n: number }>(sql`
          with s as (
            select x.id,
              (${period.from}::date::timestamp at time zone x.time_zone) as t0,
              ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
            from shops x where x.id = ${shopId}
          )
          select j.technician_id::text as key, min(u.name) as label, count(*)::int as n
          from s join jobs j on j.shop_id = s.id and j.collected_at >= s.t0
            and j.collected_at < s.t1 and j.collected_at <= ${at}::timestamptz
          left join users u on u.id = j.technician_id
          group by j.technician_id`)
      ).rows
    : [];
  const pick = (dim: string, none: string) =>
    rows
      .filter((r) => r.dim === dim)
      .map((r) => ({
        key: r.key ?? '',
        label: r.label ?? none,
        confirmed: Number(r.confirmed),
        counted: Number(r.counted),
      }))
      // Unnamed causes and steps go last: the named ones are what a lead can act on.
      .sort(
        (a, b) =>
          Number(a.key === '') - Number(b.key === '') ||
          b.confirmed - a.confirmed ||
          a.label.localeCompare(b.label),
      );
  const causes = pick('cause', 'Not recorded');
  const total = causes.reduce((n, r) => n + r.confirmed, 0);
  const totalCounted = causes.reduce((n, r) => n + r.counted, 0);
  let byTechnician: ComebackBreakdown['byTechnician'] = null;
  if (seeTechnicians) {
    const byKey = new Map(pick('tech', 'Unassigned').map((r) => [r.key, r]));
    byTechnician = collectedByTech
      .map((c) => {
        const key = c.key ?? '';
        const hit = byKey.get(key);
        return {
          key,
          label: c.label ?? 'Unassigned',
          collected: Number(c.n),
          confirmed: hit?.confirmed ?? 0,
          counted: hit?.counted ?? 0,
        };
      })
      .sort(
        (a, b) =>
          b.counted - a.counted || b.confirmed - a.confirmed || a.label.localeCompare(b.label),
      );
  }
  return {
    period,
    confirmed: total,
    counted: totalCounted,
    countedAttributions: settings.countedAttributions,
    warrantyDays: settings.warrantyDays,
    byRootCause: causes,
    byStep: pick('step', 'No step named'),
    byTechnician,
  };
}
