import { and, eq, inArray, isNotNull, isNull } from '@reelwright/db';
import { benchSessions, checklistTicks, partLines, reels } from '@reelwright/db/schema';
import type { BenchSessionInput, ChecklistInput, PartInput } from '~/lib/validators/jobs';
import { db } from '../db';
import { badRequest, conflict, notFound } from '../errors';
import type { Principal } from '../principal';
import { applicableSteps } from '../queries/bench';
import { assertOpen, lockJob, logActivity, pgError, syncTotals } from './shared';
import * as clock from '~/server/clock';

const RUNNING_INDEX = 'bench_sessions_one_running_per_technician_uq';

/**
 * Starts or stops the caller's bench timer on a job, or logs minutes by hand. A technician has at
 * most one running timer: the database's partial unique index refuses a second, reported as 409.
 */
export async function recordBenchTime(
  principal: Principal,
  id: number,
  input: BenchSessionInput,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  const conn = await db();
  try {
    await conn.transaction(async (tx) => {
      const job = await lockJob(tx, principal, id);
      assertOpen(job);
      if ('minutes' in input) {
        const [session] = await tx
          .insert(benchSessions)
          .values({
            jobId: id,
            technicianId: principal.id,
            minutes: input.minutes,
            note: input.note ?? null,
            createdAt: now,
          })
          .returning();
        await syncTotals(tx, job);
        await logActivity(tx, {
          principal,
          action: 'bench_session.add',
          entityType: 'bench_session',
          entityId: session!.id,
          shopId: job.shopId,
          after: { jobId: id, minutes: input.minutes, note: input.note ?? null },
          at: now,
        });
        return;
      }
      if (input.action === 'start') {
        if (job.state !== 'on_bench')
          throw conflict(`Put job #${id} on the bench before starting its timer.`);
        const [session] = await tx
          .insert(benchSessions)
          .values({ jobId: id, technicianId: principal.id, startedAt: now, createdAt: now })
          .returning();
        await logActivity(tx, {
          principal,
          action: 'bench_session.start',
          entityType: 'bench_session',
          entityId: session!.id,
          shopId: job.shopId,
          after: { jobId: id, startedAt: now.toISOString() },
          at: now,
        });
        return;
      }
      const [running] = await tx
        .select()
        .from(benchSessions)
        .where(
          and(
            eq(benchSessions.jobId, id),
            eq(benchSessions.technicianId, principal.id),
            isNotNull(benchSessions.startedAt),
            isNull(benchSessions.endedAt),
          ),
        );
      if (!running) throw conflict(`You have no timer running on job #${id}.`);
      const minutes = Math.max(
        0,
        Math.round((now.getTime() - running.startedAt!.getTime()) / 60_000),
      );
      await tx
        .update(benchSessions)
        .set({ endedAt: now, minutes })
        .where(eq(benchSessions.id, running.id));
      await syncTotals(tx, job);
      await logActivity(tx, {
        principal,
        action: 'bench_session.stop',
        entityType: 'bench_session',
        entityId: running.id,
        shopId: job.shopId,
        before: { endedAt: null },
        after: { jobId: id, endedAt: now.toISOString(), minutes },
        at: now,
      });
    });
  } catch (error) {
    const pg = pgError(error);
    if (pg?.code === '23505' && (pg.constraint === undefined || pg.constraint === RUNNING_INDEX)) {
      const [other] = await conn
        .select({ jobId: benchSessions.jobId })
        .from(benchSessions)
        .where(
          and(
            eq(benchSessions.technicianId, principal.id),
            isNotNull(benchSessions.startedAt),
            isNull(benchSessions.endedAt),
          ),
        );
      throw conflict(
        other?.jobId === id
          ? `Your timer is already running on job #${id}.`
          : `Your timer is already running${other ? ` on job #${other.jobId}` : ''}. Stop it before starting another: one running timer per technician.`,
      );
    }
    throw error;
  }
}

/** Adds a part line and keeps the job's parts total in step. */
export async function addPart(
  principal: Principal,
  id: number,
  input: PartInput,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  const conn = await db();
  return conn.transaction(async (tx) => {
    const job = await lockJob(tx, principal, id);
    assertOpen(job);
    const [part] = await tx
      .insert(partLines)
      .values({
        jobId: id,
        name: input.name,
        partNumber: input.partNumber ?? null,
        quantity: input.quantity,
        unitPriceCents: input.unitPriceCents,
        createdAt: now,
      })
      .returning();
    const updated = await syncTotals(tx, job);
    await logActivity(tx, {
      principal,
      action: 'part_line.add',
      entityType: 'part_line',
      entityId: part!.id,
      shopId: job.shopId,
      after: { jobId: id, ...input, partsCents: updated.partsCents },
      at: now,
    });
    return { id: part!.id };
  });
}

/** Removes a part line of the job; 404 when the line is not on this job. */
export async function deletePart(
  principal: Principal,
  id: number,
  partId: number,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  const conn = await db();
  await conn.transaction(async (tx) => {
    const job = await lockJob(tx, principal, id);
    assertOpen(job);
    const [removed] = await tx
      .delete(partLines)
      .where(and(eq(partLines.id, partId), eq(partLines.jobId, id)))
      .returning();
    if (!removed) throw notFound('part line');
    const updated = await syncTotals(tx, job);
    await logActivity(tx, {
      principal,
      action: 'part_line.delete',
      entityType: 'part_line',
      entityId: partId,
      shopId: job.shopId,
      before: {
        jobId: id,
        name: removed.name,
        partNumber: removed.partNumber,
        quantity: removed.quantity,
        unitPriceCents: removed.unitPriceCents,
      },
      after: { partsCents: updated.partsCents },
      at: now,
    });
  });
}

/**
 * Replaces the job's ticked steps with `stepIds`. Steps must belong to the standard version the job
 * was checked in under and apply to its reel; ticks that stay keep who ticked them and when.
 */
export async function setChecklist(
  principal: Principal,
  id: number,
  input: ChecklistInput,
  options: { now?: Date } = {},
) {
  const now = options.now ?? clock.now();
  const conn = await db();
  await conn.transaction(async (tx) => {
    const job = await lockJob(tx, principal, id);
    assertOpen(job);
    const [reel] = await tx
      .select({ kind: reels.kind })
      .from(reels)
      .where(eq(reels.id, job.reelId));
    const allowed = new Set(
      (await applicableSteps(job.serviceStandardId, reel!.kind, tx)).map((s) => s.id),
    );
    const wanted = [...new Set(input.stepIds)];
    const stray = wanted.filter((s) => !allowed.has(s));
    if (stray.length > 0)
      throw badRequest('Some body fields are not valid.', [
        {
          field: 'body.stepIds',
          message: `Not steps of this job’s checklist: ${stray.join(', ')}`,
        },
      ]);
    const before = (
      await tx
        .select({ stepId: checklistTicks.stepId })
        .from(checklistTicks)
        .where(eq(checklistTicks.jobId, id))
    ).map((t) => t.stepId);
    const had = new Set(before);
    const keep = new Set(wanted);
    const removed = before.filter((s) => !keep.has(s));
    const added = wanted.filter((s) => !had.has(s));
    if (removed.length > 0)
      await tx
        .delete(checklistTicks)
        .where(and(eq(checklistTicks.jobId, id), inArray(checklistTicks.stepId, removed)));
    if (added.length > 0)
      await tx
        .insert(checklistTicks)
        .values(
          added.map((stepId) => ({ jobId: id, stepId, userId: principal.id, tickedAt: now })),
        );
    if (removed.length > 0 || added.length > 0)
      await logActivity(tx, {
        principal,
        action: 'checklist.update',
        entityType: 'job',
        entityId: id,
        shopId: job.shopId,
        before: { stepIds: before.sort((a, b) => a - b) },
        after: { stepIds: wanted.sort((a, b) => a - b), added, removed },
        at: now,
      });
  });
}
