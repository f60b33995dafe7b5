import { and, eq, inArray, or, type Tx } from '@reelwright/db';
import {
  activityLog,
  comebacks,
  correctiveActions,
  jobs,
  reels,
  rootCauses,
  shops,
  users,
  type Comeback,
} from '@reelwright/db/schema';
import { dismissalText, parseDismissal, type ComebackPatch } from '~/lib/validators/comebacks';
import { db } from '../db';
import { badRequest, conflict, forbidden, notFound, type FieldError } from '../errors';
import type { Principal } from '../principal';
import { applicableSteps } from '../queries/bench';
import { getComeback, redoCost, reviewRights, type ComebackDetail } from '../queries/comebacks';
import { shopScope } from '../queries/scope';
import { queueReviewEmails } from './notify';
import * as clock from '~/server/clock';

const REVIEW_FIELDS = [
  'status',
  'dismissReason',
  'dismissNote',
  'attribution',
  'rootCauseId',
  'rootCauseNote',
  'checklistStepId',
  'disposition',
  'symptom',
  'correctiveAction',
] as const;

const invalid = (errors: FieldError[]) => badRequest('Some body fields are not valid.', errors);

function pick(row: Record<string, unknown>, keys: string[]) {
  return Object.fromEntries(
    keys.map((k) => {
      const v = row[k];
      return [k, v instanceof Date ? v.toISOString() : (v ?? null)];
    }),
  );
}

/** The comeback, locked, if the caller may read it (original shop or return shop in scope). */
async function lockComeback(tx: Tx, principal: Principal, id: number) {
  const visible = (await tx.select({ id: shops.id }).from(shops).where(shopScope(principal))).map(
    (s) => s.id,
  );
  if (visible.length === 0) throw notFound('comeback');
  const [row] = await tx
    .select({ cb: comebacks, regionId: shops.regionId, timeZone: shops.timeZone })
    .from(comebacks)
    .innerJoin(shops, eq(shops.id, comebacks.originalShopId))
    .innerJoin(jobs, eq(jobs.id, comebacks.jobId))
    .where(
      and(
        eq(comebacks.id, id),
        or(inArray(comebacks.originalShopId, visible), inArray(jobs.shopId, visible)),
      ),
    )
    .for('update', { of: comebacks });
  if (!row) throw notFound('comeback');
  return row;
}

/**
 * `PATCH /api/comebacks/{id}`: confirm or dismiss, attribute, name the root cause and the
 * checklist step, record the disposition, open a corrective action, or (a manager or the owner)
 * hand the review to someone else. The redo cost is recomputed from the return job at each save
 * of a confirmed review. One transaction: every change is logged, and a 400 writes nothing.
 */
export async function updateComeback(
  principal: Principal,
  id: number,
  patch: ComebackPatch,
  options: { now?: Date; baseUrl?: string | null } = {},
): Promise<{ comeback: ComebackDetail; emailsQueued: number }> {
  const now = options.now ?? clock.now();
  const conn = await db();
  const emailsQueued = await conn.transaction(async (tx) => {
    const { cb: before, regionId } = await lockComeback(tx, principal, id);
    const rights = reviewRights(principal, {
      originalShopId: before.originalShopId,
      originalRegionId: regionId,
      assigneeId: before.assigneeId,
    });
    const reviews = REVIEW_FIELDS.some((k) => patch[k] !== undefined);
    if (patch.assigneeId !== undefined && !rights.canReassign)
      throw forbidden('Only a regional manager or the owner hands a review to someone else.');
    if (reviews && !rights.canReview)
      throw forbidden(
        "Only the original shop's lead, the person the review is assigned to, or a regional manager or the owner reviews a comeback.",
      );

    const errors: FieldError[] = [];
    const status = patch.status ?? before.status;
    const attribution = patch.attribution !== undefined ? patch.attribution : before.attribution;
    const stored = parseDismissal(before.dismissReason);
    const reason = patch.dismissReason !== undefined ? patch.dismissReason : stored.reason;
    const note = patch.dismissNote !== undefined ? patch.dismissNote : stored.note;
    if (status === 'confirmed' && !attribution)
      errors.push({
        field: 'body.attribution',
        message: 'A confirmed comeback needs an attribution',
      });
    if (status === 'dismissed' && !reason)
      errors.push({
        field: 'body.dismissReason',
        message: 'Say why it is dismissed: not the same fault, outside the window, or not our work',
      });
    if (patch.rootCauseId != null && patch.rootCauseId !== before.rootCauseId) {
      const [cause] = await tx
        .select({ active: rootCauses.active })
        .from(rootCauses)
        .where(eq(rootCauses.id, patch.rootCauseId));
      if (!cause?.active)
        errors.push({ field: 'body.rootCauseId', message: 'Choose a root cause from the list' });
    }
    if (patch.checklistStepId != null && patch.checklistStepId !== before.checklistStepId) {
      const [original] = await tx
        .select({ standardId: jobs.serviceStandardId, kind: reels.kind })
        .from(jobs)
        .innerJoin(reels, eq(reels.id, jobs.reelId))
        .where(eq(jobs.id, before.originalJobId));
      const steps = await applicableSteps(original?.standardId ?? null, original?.kind ?? '', tx);
      if (!steps.some((s) => s.id === patch.checklistStepId))
        errors.push({
          field: 'body.checklistStepId',
          message: "Choose a step of the original job's checklist",
        });
    }
    if (patch.assigneeId != null) {
      const [person] = await tx
        .select({ id: users.id })
        .from(users)
        .where(
          and(
            eq(users.id, patch.assigneeId),
            eq(users.active, true),
            or(
              and(eq(users.role, 'shop_lead'), eq(users.shopId, before.originalShopId)),
              and(eq(users.role, 'regional_manager'), eq(users.regionId, regionId)),
              eq(users.role, 'owner'),
            ),
          ),
        );
      if (!person)
        errors.push({
          field: 'body.assigneeId',
          message: "Choose the original shop's lead, its regional manager or the owner",
        });
    }
    const action = patch.correctiveAction;
    if (action) {
      if (status !== 'confirmed')
        errors.push({
          field: 'body.correctiveAction',
          message: 'Confirm the comeback before opening a corrective action',
        });
      const [owner] = await tx
        .select({ id: users.id })
        .from(users)
        .where(
          and(
            eq(users.id, action.ownerId),
            eq(users.shopId, before.originalShopId),
            eq(users.active, true),
            inArray(users.role, ['shop_lead', 'technician']),
          ),
        );
      if (!owner)
        errors.push({
          field: 'body.correctiveAction.ownerId',
          message: 'Choose someone who works at the shop that did the work',
        });
    }
    if (errors.length) throw invalid(errors);
    if (action) {
      const [existing] = await tx
        .select({ id: correctiveActions.id })
        .from(correctiveActions)
        .where(eq(correctiveActions.comebackId, id));
      if (existing)
        throw conflict(
          `Corrective action #${existing.id} is already open for this comeback; follow it up there.`,
        );
    }

    const changes: Partial<Comeback> = {};
    if (patch.status !== undefined) changes.status = patch.status;
    if (patch.attribution !== undefined) changes.attribution = patch.attribution;
    if (patch.rootCauseId !== undefined) changes.rootCauseId = patch.rootCauseId;
    if (patch.rootCauseNote !== undefined) changes.rootCauseNote = patch.rootCauseNote;
    if (patch.checklistStepId !== undefined) changes.checklistStepId = patch.checklistStepId;
    if (patch.disposition !== undefined) changes.disposition = patch.disposition;
    if (patch.symptom !== undefined) changes.symptom = patch.symptom;
    if (patch.assigneeId !== undefined) changes.assigneeId = patch.assigneeId;
    const dismissal = status === 'dismissed' && reason ? dismissalText(reason, note) : null;
    if (dismissal !== before.dismissReason) changes.dismissReason = dismissal;
    if (status === 'confirmed') {
      const cost = await redoCost(before.jobId, tx);
      changes.redoCostCents = cost.totalCents;
    } else if (before.redoCostCents !== null) changes.redoCostCents = null;
    const decided =
      status !== before.status ||
      (changes.attribution !== undefined && changes.attribution !== before.attribution) ||
      (changes.dismissReason !== undefined && changes.dismissReason !== before.dismissReason);
    if (decided) {
      changes.reviewerId = status === 'open' ? null : principal.id;
      changes.reviewedAt = status === 'open' ? null : now;
    }
    const changed = Object.keys(changes).filter(
      (k) =>
        JSON.stringify(changes[k as keyof Comeback] ?? null) !==
        JSON.stringify(before[k as keyof Comeback] ?? null),
    );

    if (changed.length) {
      const [after] = await tx
        .update(comebacks)
        .set({ ...changes, updatedAt: now })
        .where(eq(comebacks.id, id))
        .returning();
      const reassigned = changed.includes('assigneeId');
      const reviewKeys = changed.filter((k) => k !== 'assigneeId');
      if (reviewKeys.length) {
        const verb =
          status !== before.status
            ? status === 'confirmed'
              ? 'comeback.confirm'
              : status === 'dismissed'
                ? 'comeback.dismiss'
                : 'comeback.reopen'
            : 'comeback.update';
        await tx.insert(activityLog).values({
          at: now,
          userId: principal.id,
          action: verb,
          entityType: 'comeback',
          entityId: id,
          shopId: before.originalShopId,
          before: pick(before, reviewKeys),
          after: pick(after!, reviewKeys),
        });
      }
      if (reassigned)
        await tx.insert(activityLog).values({
          at: now,
          userId: principal.id,
          action: 'comeback.reassign',
          entityType: 'comeback',
          entityId: id,
          shopId: before.originalShopId,
          before: { assigneeId: before.assigneeId },
          after: { assigneeId: after!.assigneeId },
        });
    }

    if (action) {
      const [created] = await tx
        .insert(correctiveActions)
        .values({
          shopId: before.originalShopId,
          source: 'comeback',
          comebackId: id,
          title: action.title,
          description: action.description ?? null,
          ownerId: action.ownerId,
          dueOn: action.dueOn,
          status: 'open',
          createdById: principal.id,
          createdAt: now,
          updatedAt: now,
        })
        .returning({ id: correctiveActions.id });
      const facts = {
        comebackId: id,
        ownerId: action.ownerId,
        dueOn: action.dueOn,
        status: 'open',
      };
      await tx.insert(activityLog).values([
        {
          at: now,
          userId: principal.id,
          action: 'corrective_action.open',
          entityType: 'corrective_action',
          entityId: created!.id,
          shopId: before.originalShopId,
          before: null,
          after: { ...facts, title: action.title },
        },
        {
          at: now,
          userId: principal.id,
          action: 'comeback.corrective_action',
          entityType: 'comeback',
          entityId: id,
          shopId: before.originalShopId,
          before: null,
          after: { correctiveActionId: created!.id, ...facts },
        },
      ]);
    }

    // The new assignee hears of it by e-mail, with the same link as the shop lead got.
    if (patch.assigneeId != null && patch.assigneeId !== before.assigneeId) {
      const [person] = await tx
        .select({ name: users.name, email: users.email })
        .from(users)
        .where(eq(users.id, patch.assigneeId));
      return queueReviewEmails(tx, before, [person!], {
        assignedBy: principal.name,
        baseUrl: options.baseUrl,
      });
    }
    return 0;
  });
  return { comeback: await getComeback(principal, id, now), emailsQueued };
}
