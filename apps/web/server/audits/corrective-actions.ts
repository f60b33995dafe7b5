import { and, eq, inArray } from '@reelwright/db';
import { activityLog, correctiveActions, shops, users } from '@reelwright/db/schema';
import {
  correctiveActionMoves,
  type CorrectiveActionPatch,
  CORRECTIVE_ACTION_STATUSES,
} from '~/lib/validators/audits';
import { db } from '../db';
import { badRequest, conflict, forbidden, notFound } from '../errors';
import type { Principal } from '../principal';
import {
  getCorrectiveAction,
  moverOf,
  type CorrectiveActionRow,
} from '../queries/corrective-actions';
import { shopScope } from '../queries/scope';
import * as clock from '~/server/clock';

const STATUS_WORDS: Record<(typeof CORRECTIVE_ACTION_STATUSES)[number], string> = {
  open: 'open',
  in_progress: 'in progress',
  done: 'done',
  verified: 'verified',
};

/**
 * Changes a corrective action. The shop lead moves it along and says what was done; a regional
 * manager or the owner verifies it (or sends it back) and may change its description, due date
 * and owner. A verified action is closed. One transaction with its activity log row.
 */
export async function updateCorrectiveAction(
  principal: Principal,
  id: number,
  patch: CorrectiveActionPatch,
): Promise<CorrectiveActionRow> {
  const conn = await db();
  await conn.transaction(async (tx) => {
    const [row] = await tx
      .select({ action: correctiveActions })
      .from(correctiveActions)
      .innerJoin(shops, eq(shops.id, correctiveActions.shopId))
      .where(and(eq(correctiveActions.id, id), shopScope(principal)))
      .for('update', { of: correctiveActions });
    if (!row) throw notFound('corrective action');
    const before = row.action;
    if (before.status === 'verified')
      throw conflict(`Corrective action #${id} is verified and closed.`);
    const mover = moverOf(principal);
    const editsDetails =
      patch.description !== undefined || patch.dueOn !== undefined || patch.ownerId !== undefined;
    if (editsDetails && mover !== 'verifier')
      throw forbidden(
        'Only a regional manager or the owner changes the description, due date or owner.',
      );

    const changes: Partial<typeof correctiveActions.$inferInsert> = {};
    const now = clock.now();
    if (patch.status !== undefined && patch.status !== before.status) {
      const allowed = correctiveActionMoves(mover, before.status);
      if (!allowed.includes(patch.status)) {
        const target = patch.status;
        const other = mover === 'verifier' ? 'shop_lead' : 'verifier';
        const everAllowed = CORRECTIVE_ACTION_STATUSES.some((s) =>
          correctiveActionMoves(mover, s).includes(target),
        );
        // Another role's move (or one this role never makes) is a permission matter, not a state one.
        if (!everAllowed || correctiveActionMoves(other, before.status).includes(target))
          throw forbidden(
            mover === 'verifier'
              ? 'The shop lead moves a corrective action along; you verify it once it is done.'
              : 'A regional manager or the owner verifies a corrective action.',
          );
        throw conflict(
          `A corrective action that is ${STATUS_WORDS[before.status]} cannot become ${STATUS_WORDS[target]}.`,
        );
      }
      changes.status = patch.status;
      if (patch.status === 'done') {
        const note = patch.resolutionNote ?? before.resolutionNote;
        if (!note)
          throw badRequest('Say what was done before marking the action done.', [
            { field: 'body.resolutionNote', message: 'Say what was done' },
          ]);
        changes.doneAt = now;
      }
      if (patch.status === 'verified') {
        changes.verifiedAt = now;
        changes.verifiedById = principal.id;
      }
      if (patch.status === 'in_progress' && before.status === 'done') changes.doneAt = null;
    }
    if (patch.resolutionNote !== undefined) changes.resolutionNote = patch.resolutionNote || null;
    if (patch.description !== undefined) changes.description = patch.description;
    if (patch.dueOn !== undefined) changes.dueOn = patch.dueOn;
    if (patch.ownerId !== undefined) {
      if (patch.ownerId !== null) {
        const [owner] = await tx
          .select({ id: users.id })
          .from(users)
          .where(
            and(
              eq(users.id, patch.ownerId),
              eq(users.shopId, before.shopId),
              eq(users.active, true),
              inArray(users.role, ['shop_lead', 'technician']),
            ),
          );
        if (!owner)
          throw badRequest('Some body fields are not valid.', [
            { field: 'body.ownerId', message: 'Choose someone who works at the shop' },
          ]);
      }
      changes.ownerId = patch.ownerId;
    }
    if (Object.keys(changes).length === 0) return;
    const [after] = await tx
      .update(correctiveActions)
      .set(changes)
      .where(eq(correctiveActions.id, id))
      .returning();
    await tx.insert(activityLog).values({
      at: now,
      userId: principal.id,
      action: changes.status ? `corrective_action.${changes.status}` : 'corrective_action.update',
      entityType: 'corrective_action',
      entityId: id,
      shopId: before.shopId,
      before: pick(before, Object.keys(changes)),
      after: after ? pick(after, Object.keys(changes)) : null,
    });
  });
  return getCorrectiveAction(principal, id);
}

function pick(row: Record<string, unknown>, keys: string[]) {
  return Object.fromEntries(
    keys.map((k) => {
      const v = row[k];
      return [k, v instanceof Date ? v.toISOString() : (v ?? null)];
    }),
  );
}
