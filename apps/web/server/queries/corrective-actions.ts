import { aliasedTable, and, asc, eq, sql, type SQL } from '@reelwright/db';
import { correctiveActions, shops, users } from '@reelwright/db/schema';
import { can } from '~/lib/permissions';
import {
  correctiveActionMoves,
  type CorrectiveActionListQuery,
  type CorrectiveActionMover,
  type CorrectiveActionStatusValue,
} from '~/lib/validators/audits';
import { localToday } from '../audits/sampling';
import { db } from '../db';
import { notFound } from '../errors';
import type { Principal } from '../principal';
import { shopFilter, shopScope } from './scope';
import * as clock from '~/server/clock';

export interface CorrectiveActionRow {
  id: number;
  shop: { id: number; name: string; timeZone: string };
  source: 'audit' | 'comeback' | 'other';
  auditRoundId: number | null;
  comebackId: number | null;
  title: string;
  description: string | null;
  owner: { id: number; name: string } | null;
  dueOn: string;
  status: CorrectiveActionStatusValue;
  resolutionNote: string | null;
  createdAt: string;
  doneAt: string | null;
  verifiedAt: string | null;
  verifiedBy: string | null;
  /** Not done by its due date (a local date in the shop's zone). */
  overdue: boolean;
  /** Status changes the caller may make now. */
  moves: CorrectiveActionStatusValue[];
  /** Whether the caller may change the description, due date and owner. */
  canEdit: boolean;
}

/** Who the caller is when moving corrective actions along: the shop lead or a verifier. */
export function moverOf(principal: Principal): CorrectiveActionMover | null {
  if (principal.role === 'shop_lead') return 'shop_lead';
  if (can(principal.role, 'corrective-actions:verify')) return 'verifier';
  return null;
}

const verifier = aliasedTable(users, 'verifier');

function rows(principal: Principal, where: SQL | undefined) {
  return db().then((conn) =>
    conn
      .select({
        action: correctiveActions,
        shopName: shops.name,
        timeZone: shops.timeZone,
        ownerName: users.name,
        verifiedBy: verifier.name,
      })
      .from(correctiveActions)
      .innerJoin(shops, eq(shops.id, correctiveActions.shopId))
      .leftJoin(users, eq(users.id, correctiveActions.ownerId))
      .leftJoin(verifier, eq(verifier.id, correctiveActions.verifiedById))
      .where(and(shopScope(principal), where))
      .orderBy(
        sql`case ${correctiveActions.status} when 'verified' then 1 else 0 end`,
        asc(correctiveActions.dueOn),
        asc(correctiveActions.id),
      ),
  );
}

function toRow(
  principal: Principal,
  r: Awaited<ReturnType<typeof rows>>[number],
  now: Date,
): CorrectiveActionRow {
  const a = r.action;
  const mover = moverOf(principal);
  return {
    id: a.id,
    shop: { id: a.shopId, name: r.shopName, timeZone: r.timeZone },
    source: a.source,
    auditRoundId: a.auditRoundId,
    comebackId: a.comebackId,
    title: a.title,
    description: a.description,
    owner: a.ownerId == null ? null : { id: a.ownerId, name: r.ownerName ?? '' },
    dueOn: a.dueOn,
    status: a.status,
    resolutionNote: a.resolutionNote,
    createdAt: a.createdAt.toISOString(),
    doneAt: a.doneAt?.toISOString() ?? null,
    verifiedAt: a.verifiedAt?.toISOString() ?? null,
    verifiedBy: r.verifiedBy,
    overdue:
      (a.status === 'open' || a.status === 'in_progress') && a.dueOn < localToday(r.timeZone, now),
    moves: correctiveActionMoves(mover, a.status),
    canEdit: mover === 'verifier' && a.status !== 'verified',
  };
}

/** Corrective actions of the caller's shops: unverified first, soonest due first; 404 for a shop filter outside them. */
export async function listCorrectiveActions(
  principal: Principal,
  query: CorrectiveActionListQuery = {},
  now = clock.now(),
): Promise<CorrectiveActionRow[]> {
  await shopFilter(principal, query.shopId);
  const list = await rows(
    principal,
    and(
      query.shopId === undefined ? undefined : eq(correctiveActions.shopId, query.shopId),
      query.status === undefined ? undefined : eq(correctiveActions.status, query.status),
    ),
  );
  return list.map((r) => toRow(principal, r, now));
}

/** One corrective action inside the caller's shops; 404 otherwise. */
export async function getCorrectiveAction(
  principal: Principal,
  id: number,
  now = clock.now(),
): Promise<CorrectiveActionRow> {
  const [row] = await rows(principal, eq(correctiveActions.id, id));
  if (!row) throw notFound('corrective action');
  return toRow(principal, row, now);
}
