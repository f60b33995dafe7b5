import { and, asc, eq, or, sql, type Tx } from '@reelwright/db';
import {
  activityLog,
  benchSessions,
  checklistTicks,
  comebacks,
  correctiveActions,
  jobs,
  partLines,
  reels,
  serviceStandardSteps,
  shops,
  users,
  type ComebackAttribution,
} from '@reelwright/db/schema';
import { can } from '~/lib/permissions';
import { parseDismissal, type DismissReasonValue } from '~/lib/validators/comebacks';
import { addDays, localToday } from '../../audits/sampling';
import { benchChargeCents } from '../../bench/shared';
import { listRootCauses, loadComebackSettings } from '../../comebacks/settings';
import { db } from '../../db';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { applicableSteps } from '../bench';
import { originalJob, readScope, reviewRights, scopeShops } from './shared';
import { baseQuery, toRow, type ComebackRow } from './list';
import * as clock from '~/server/clock';

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

/**
 * `GET /api/comebacks/{id}`: the review with both jobs side by side, the redo cost and how it is
 * made up, the choices the form offers and the review's history. The original shop and the shop
 * the reel came back to can read it; anyone else gets 404.
 */
export async function getComeback(
  principal: Principal,
  id: number,
  now = clock.now(),
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
