import { and, eq, isNull } from '@reelwright/db';
import { activityLog, monthCloses } from '@reelwright/db/schema';
import { db } from '../db';
import { conflict, forbidden } from '../errors';
import type { Principal } from '../principal';
import { currentClose, monthEnded } from '../queries/month-close';
import { auditsByShop, computeNetwork, networkRules } from './compute';
import { monthLabel } from './period';
import * as clock from '~/server/clock';

/** Postgres "unique_violation", however the driver wraps it. */
export function isUniqueViolation(error: unknown): boolean {
  for (let e = error; e && typeof e === 'object'; e = (e as { cause?: unknown }).cause) {
    if ((e as { code?: unknown }).code === '23505') return true;
  }
  return false;
}

/**
 * Closes the month for the whole network: every shop's figures and the totals are computed with
 * warranty windows judged at this moment and frozen in month_closes, so a later edit to a job
 * shows as a difference against the live figures instead of silently changing the record.
 */
export async function closeMonth(
  principal: Principal,
  month: string,
  options: { now?: Date } = {},
) {
  if (principal.scope.kind !== 'network') throw forbidden('Only the owner closes a month.');
  const now = options.now ?? clock.now();
  const conn = await db();
  if (!(await monthEnded(conn, month, now)))
    throw conflict(`${monthLabel(month)} has not ended in every shop yet; close it once it has.`);
  if (await currentClose(conn, month)) throw conflict(`${monthLabel(month)} is already closed.`);
  const figures = await computeNetwork(
    conn,
    month,
    await networkRules(conn, now, month),
    await auditsByShop(principal, month),
  );
  try {
    return await conn.transaction(async (tx) => {
      const [row] = await tx
        .insert(monthCloses)
        .values({
          month,
          figures: figures as unknown as Record<string, unknown>,
          closedAt: now,
          closedById: principal.id,
        })
        .returning({ id: monthCloses.id });
      await tx.insert(activityLog).values({
        at: now,
        userId: principal.id,
        action: 'month.close',
        entityType: 'month_close',
        entityId: row!.id,
        after: {
          month,
          shops: figures.shops.length,
          royaltyCents: figures.totals.network.royaltyCents,
        },
      });
      return { id: row!.id };
    });
  } catch (error) {
    if (isUniqueViolation(error)) throw conflict(`${monthLabel(month)} is already closed.`);
    throw error;
  }
}

/** Reopens a closed month; the close stays on record with who reopened it, when and why. */
export async function reopenMonth(
  principal: Principal,
  month: string,
  reason: string,
  options: { now?: Date } = {},
) {
  if (principal.scope.kind !== 'network') throw forbidden('Only the owner reopens a month.');
  const now = options.now ?? clock.now();
  const conn = await db();
  return conn.transaction(async (tx) => {
    const [row] = await tx
      .update(monthCloses)
      .set({ reopenedAt: now, reopenedById: principal.id, reopenReason: reason })
      .where(and(eq(monthCloses.month, month), isNull(monthCloses.reopenedAt)))
      .returning({ id: monthCloses.id });
    if (!row) throw conflict(`${monthLabel(month)} is not closed.`);
    await tx.insert(activityLog).values({
      at: now,
      userId: principal.id,
      action: 'month.reopen',
      entityType: 'month_close',
      entityId: row.id,
      after: { month, reason },
    });
    return { id: row.id };
  });
}
