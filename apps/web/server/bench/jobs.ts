import { and, asc, eq, isNotNull, isNull } from '@reelwright/db';
import {
  benchSessions,
  checklistTicks,
  customers,
  jobEvents,
  jobs,
  reels,
  shops,
  type Job,
} from '@reelwright/db/schema';
import { jobTurnaround, type WaitingSpan } from '@reelwright/metrics';
import { JOB_STATE_LABELS } from '~/lib/labels';
import { canMove, NEXT_STATES, type JobPatch, type TransitionInput } from '~/lib/validators/jobs';
import { db } from '../db';
import { queueEmail } from '../mail/outbox';
import { readyForPickupEmail } from '../mail/templates';
import { badRequest, conflict } from '../errors';
import type { Principal } from '../principal';
import { applicableSteps } from '../queries/bench';
import { localDate, promiseInstant, shopCalendar } from './calendar';
import { assertBenchPerson } from './check-in';
import {
  assertOpen,
  benchChargeCents,
  flatPrice,
  labourRate,
  lockJob,
  logActivity,
  syncTotals,
} from './shared';
import * as clock from '~/server/clock';

const invalid = (field: string, message: string) =>
  badRequest('Some body fields are not valid.', [{ field: `body.${field}`, message }]);

/** Edits the job's record and money; one transaction with its activity row. */
export async function patchJob(
  principal: Principal,
  id: number,
  patch: JobPatch,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  const conn = await db();
  await conn.transaction(async (tx) => {
    const job = await lockJob(tx, principal, id);
    assertOpen(job);
    const changes: Partial<Job> = {};
    if (patch.findings !== undefined) changes.findings = patch.findings || null;
    if (patch.complaint !== undefined) changes.complaint = patch.complaint || null;
    if (patch.condition !== undefined) changes.condition = patch.condition || null;
    if (patch.technicianId !== undefined) {
      if (patch.technicianId !== null)
        await assertBenchPerson(tx, job.shopId, patch.technicianId, 'body.technicianId');
      changes.technicianId = patch.technicianId;
    }
    if (patch.promisedOn !== undefined) {
      const [shop] = await tx.select().from(shops).where(eq(shops.id, job.shopId));
      const calendar = shopCalendar(shop!);
      if (patch.promisedOn < localDate(job.checkedInAt, calendar.timeZone))
        throw invalid('promisedOn', 'The promised date cannot be before the check-in');
      changes.promisedAt = promiseInstant(patch.promisedOn, calendar);
    }
    if (patch.labourBasis === 'flat_price') {
      const flat = await flatPrice(tx, job.shopId, job.serviceType);
      if (flat === null)
        throw invalid(
          'labourBasis',
          'This service has no flat price at this shop: charge bench time',
        );
      changes.labourCents = flat;
    } else if (patch.labourBasis === 'bench_time') {
      changes.labourCents = benchChargeCents(
        job.benchMinutes ?? 0,
        await labourRate(tx, job.shopId),
      );
    }
    const labour = changes.labourCents ?? job.labourCents;
    if (patch.discountCents !== undefined) {
      if (patch.discountCents > labour + job.partsCents)
        throw invalid(
          'discountCents',
          'The discount cannot be more than labour and parts together',
        );
      changes.discountCents = patch.discountCents;
    } else if (job.discountCents > labour + job.partsCents) {
      changes.discountCents = labour + job.partsCents;
    }
    const [updated] = await tx
      .update(jobs)
      .set({ ...changes, updatedAt: now })
      .where(eq(jobs.id, id))
      .returning();
    const before = Object.fromEntries(Object.keys(changes).map((k) => [k, job[k as keyof Job]]));
    const after = Object.fromEntries(
      Object.keys(changes).map((k) => [k, updated![k as keyof Job]]),
    );
    await logActivity(tx, {
      principal,
      action: 'job.update',
      entityType: 'job',
      entityId: id,
      shopId: job.shopId,
      before,
      after,
      at: now,
    });
  });
}

/** The waiting-on-parts spells in a job's timeline: each runs to the next event (or is open). */
export function waitingSpans(
  events: readonly { toState: Job['state']; at: Date }[],
): WaitingSpan[] {
  const spans: WaitingSpan[] = [];
  events.forEach((e, i) => {
    if (e.toState === 'waiting_parts') spans.push({ from: e.at, to: events[i + 1]?.at ?? null });
  });
  return spans;
}

/**
 * Moves a job to its next state (409 for any move the bench does not allow) and keeps the move in
 * its timeline. Leaving the bench stops running timers on the job. Becoming ready needs a reason
 * when required checklist steps are unticked, stores the job's turnaround in business minutes and
 * queues the ready-for-pickup e-mail in the same transaction (the caller delivers it after commit).
 */
export async function transitionJob(
  principal: Principal,
  id: number,
  input: TransitionInput,
  options: { now?: Date } = {},
): Promise<{ emailQueued: boolean }> {
  const now = options.now ?? clock.now();
  const conn = await db();
  return conn.transaction(async (tx) => {
    let job = await lockJob(tx, principal, id);
    if (!canMove(job.state, input.to)) {
      const allowed = NEXT_STATES[job.state].map((s) => JOB_STATE_LABELS[s]);
      throw conflict(
        `A job that is ${JOB_STATE_LABELS[job.state].toLowerCase()} cannot move to ${JOB_STATE_LABELS[input.to].toLowerCase()}. ` +
          (allowed.length ? `It can move to: ${allowed.join(', ')}.` : 'It is closed.'),
      );
    }
    const [shop] = await tx.select().from(shops).where(eq(shops.id, job.shopId));
    const [reel] = await tx.select().from(reels).where(eq(reels.id, job.reelId));
    const calendar = shopCalendar(shop!);
    const changes: Partial<Job> = { state: input.to, stateChangedAt: now, updatedAt: now };

    let missing: string[] = [];
    if (input.to === 'ready') {
      const steps = await applicableSteps(job.serviceStandardId, reel!.kind, tx);
      const ticked = new Set(
        (
          await tx
            .select({ stepId: checklistTicks.stepId })
            .from(checklistTicks)
            .where(eq(checklistTicks.jobId, id))
        ).map((t) => t.stepId),
      );
      missing = steps.filter((s) => s.required && !ticked.has(s.id)).map((s) => s.title);
      if (missing.length > 0 && !input.reason)
        throw invalid(
          'reason',
          `${missing.length} required checklist ${missing.length === 1 ? 'step is' : 'steps are'} unticked (${missing.join('; ')}). Tick them, or say why the job is ready without them.`,
        );
    }

    if (input.to === 'waiting_parts' || input.to === 'ready') {
      const running = await tx
        .select()
        .from(benchSessions)
        .where(
          and(
            eq(benchSessions.jobId, id),
            isNotNull(benchSessions.startedAt),
            isNull(benchSessions.endedAt),
          ),
        );
      for (const s of running) {
        const minutes = Math.max(0, Math.round((now.getTime() - s.startedAt!.getTime()) / 60_000));
        await tx
          .update(benchSessions)
          .set({ endedAt: now, minutes })
          .where(eq(benchSessions.id, s.id));
      }
      if (running.length > 0) job = await syncTotals(tx, job);
    }

    await tx.insert(jobEvents).values({
      jobId: id,
      fromState: job.state,
      toState: input.to,
      at: now,
      userId: principal.id,
      note: input.note ?? null,
    });

    if (input.to === 'on_bench' && job.technicianId === null) changes.technicianId = principal.id;
    if (input.to === 'collected') changes.collectedAt = now;
    if (input.to === 'ready') {
      const events = await tx
        .select({ toState: jobEvents.toState, at: jobEvents.at })
        .from(jobEvents)
        .where(eq(jobEvents.jobId, id))
        .orderBy(asc(jobEvents.at), asc(jobEvents.id));
      const t = jobTurnaround(
        { checkedInAt: job.checkedInAt, readyAt: now, waitingSpans: waitingSpans(events) },
        calendar,
      );
      const customerMinutes = Math.round(t.customerMinutes);
      const waitingMinutes = Math.round(t.waitingMinutes);
      Object.assign(changes, {
        readyAt: now,
        customerTurnaroundMinutes: customerMinutes,
        waitingPartsMinutes: waitingMinutes,
        benchTurnaroundMinutes: customerMinutes - waitingMinutes,
        incompleteChecklistReason: missing.length > 0 ? input.reason! : null,
      });
      // A job that reaches ready with no labour charge gets its service's usual one.
      if (job.labourCents === 0) {
        const flat = await flatPrice(tx, job.shopId, job.serviceType);
        const labour = flat ?? benchChargeCents(job.benchMinutes ?? 0, shop!.labourRateCents);
        if (labour !== 0) changes.labourCents = labour;
      }
      await tx
        .update(reels)
        .set({ lastServicedOn: localDate(now, calendar.timeZone) })
        .where(eq(reels.id, job.reelId));
    }
    const [updated] = await tx.update(jobs).set(changes).where(eq(jobs.id, id)).returning();
    await logActivity(tx, {
      principal,
      action: 'job.transition',
      entityType: 'job',
      entityId: id,
      shopId: job.shopId,
      before: { state: job.state },
      after: {
        state: input.to,
        ...(input.to === 'ready'
          ? {
              customerTurnaroundMinutes: updated!.customerTurnaroundMinutes,
              benchTurnaroundMinutes: updated!.benchTurnaroundMinutes,
              waitingPartsMinutes: updated!.waitingPartsMinutes,
              benchMinutes: updated!.benchMinutes,
              incompleteChecklistReason: updated!.incompleteChecklistReason,
            }
          : {}),
      },
      at: now,
    });

    let emailQueued = false;
    if (input.to === 'ready') {
      const [customer] = await tx
        .select({ name: customers.name, email: customers.email })
        .from(customers)
        .where(eq(customers.id, job.customerId));
      if (customer?.email) {
        const message = readyForPickupEmail({
          shopName: shop!.name,
          customerName: customer.name,
          reel: [reel!.maker, reel!.model, reel!.size].filter(Boolean).join(' '),
          jobId: id,
          openingHours: shop!.openingHours,
          shopPhone: shop!.phone,
          shopEmail: shop!.email,
        });
        await queueEmail(tx, {
          kind: 'job_ready',
          to: customer.email,
          ...message,
          jobId: id,
          shopId: job.shopId,
        });
        emailQueued = true;
      }
    }
    return { emailQueued };
  });
}
