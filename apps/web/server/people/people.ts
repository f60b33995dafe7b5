import {
  aliasedTable,
  and,
  asc,
  desc,
  eq,
  inArray,
  ne,
  or,
  sql,
  type SQL,
  type Tx,
} from '@reelwright/db';
import { accountLinks, activityLog, regions, shops, users, type User } from '@reelwright/db/schema';
import { ROLE_LABELS, type Role } from '~/lib/permissions';
import {
  scopeProblem,
  type InviteAction,
  type InviteInput,
  type PersonPatch,
} from '~/lib/validators/people';
import { db } from '../db';
import { badRequest, conflict, notFound } from '../errors';
import { queueEmail } from '../mail/outbox';
import type { Principal } from '../principal';
import { invitationEmail } from './emails';
import { issueLink, linkUrl, withdrawLinks } from './links';

export type PersonStatus = 'active' | 'invited' | 'deactivated';

export interface PersonRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  status: PersonStatus;
  shopId: number | null;
  shopName: string | null;
  regionId: number | null;
  regionName: string | null;
  lastSignInAt: Date | null;
}

const statusOf = (u: { active: boolean; passwordHash: string | null }): PersonStatus =>
  !u.active ? 'deactivated' : u.passwordHash === null ? 'invited' : 'active';

/**
 * The people a caller may see: the owner everyone; a regional manager the people of the region's
 * shops and the region's managers (owners and auditors work network-wide and are not listed).
 */
function peopleScope(principal: Principal): SQL | undefined {
  if (principal.scope.kind === 'network') return undefined;
  if (principal.scope.kind === 'region') {
    const regionId = principal.scope.regionId;
    return or(
      eq(users.regionId, regionId),
      inArray(
        users.shopId,
        sql`(select ${shops.id} from ${shops} where ${shops.regionId} = ${regionId})`,
      ),
    );
  }
  // Nobody else lists people; the permission table keeps them out before this.
  return sql`false`;
}

const personColumns = {
  id: users.id,
  name: users.name,
  email: users.email,
  role: users.role,
  active: users.active,
  passwordHash: users.passwordHash,
  shopId: users.shopId,
  shopName: shops.name,
  regionId: users.regionId,
  regionName: regions.name,
  lastSignInAt: users.lastSignInAt,
};

function toRow(r: {
  [K in keyof typeof personColumns]: unknown;
}): PersonRow {
  const { passwordHash, active, ...rest } = r as Omit<PersonRow, 'status'> & {
    passwordHash: string | null;
    active: boolean;
  };
  return { ...rest, status: statusOf({ active, passwordHash }) };
}

/** Everyone the caller may see, with role, scope and whether they are active, invited or gone. */
export async function listPeople(
  principal: Principal,
  filter: { status?: PersonStatus } = {},
): Promise<PersonRow[]> {
  const rows = await (
    await db()
  )
    .select(personColumns)
    .from(users)
    .leftJoin(shops, eq(shops.id, users.shopId))
    .leftJoin(regions, eq(regions.id, users.regionId))
    .where(peopleScope(principal))
    .orderBy(asc(users.role), asc(users.name), asc(users.id));
  const people = rows.map(toRow);
  return filter.status ? people.filter((p) => p.status === filter.status) : people;
}

export interface PersonHistoryEntry {
  at: Date;
  action: string;
  by: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

export interface PersonDetail extends PersonRow {
  createdAt: Date;
  /** The latest invitation link, while the person has not set a password. */
  invitation: { sentAt: Date; expiresAt: Date; state: 'pending' | 'expired' | 'withdrawn' } | null;
  /** Who changed what about this person, newest first. */
  history: PersonHistoryEntry[];
}

/** One person in the caller's view (404 outside it), with their invitation and history. */
export async function getPerson(
  principal: Principal,
  id: number,
  now = new Date(),
): Promise<PersonDetail> {
  const conn = await db();
  const [row] = await conn
    .select({ ...personColumns, createdAt: users.createdAt })
    .from(users)
    .leftJoin(shops, eq(shops.id, users.shopId))
    .leftJoin(regions, eq(regions.id, users.regionId))
    .where(and(eq(users.id, id), peopleScope(principal)));
  if (!row) throw notFound('person');
  const person = toRow(row);
  let invitation: PersonDetail['invitation'] = null;
  if (row.passwordHash === null) {
    const [link] = await conn
      .select()
      .from(accountLinks)
      .where(and(eq(accountLinks.userId, id), eq(accountLinks.purpose, 'invitation')))
      .orderBy(desc(accountLinks.createdAt), desc(accountLinks.id))
      .limit(1);
    if (link)
      invitation = {
        sentAt: link.createdAt,
        expiresAt: link.expiresAt,
        state:
          link.withdrawnAt || link.usedAt
            ? 'withdrawn'
            : link.expiresAt <= now
              ? 'expired'
              : 'pending',
      };
  }
  const actor = aliasedTable(users, 'actor');
  const history = await conn
    .select({
      at: activityLog.at,
      action: activityLog.action,
      by: actor.name,
      before: activityLog.before,
      after: activityLog.after,
    })
    .from(activityLog)
    .leftJoin(actor, eq(actor.id, activityLog.userId))
    .where(and(eq(activityLog.entityType, 'user'), eq(activityLog.entityId, id)))
    .orderBy(desc(activityLog.at), desc(activityLog.id))
    .limit(200);
  return { ...person, createdAt: row.createdAt, invitation, history };
}

/** Writes a change to a person into the activity log, scoped to their shop (if any). */
async function logPersonChange(
  tx: Tx,
  entry: {
    by: number | null;
    action: string;
    userId: number;
    shopId: number | null;
    before?: Record<string, unknown> | null;
    after?: Record<string, unknown> | null;
    at: Date;
  },
) {
  await tx.insert(activityLog).values({
    at: entry.at,
    userId: entry.by,
    action: entry.action,
    entityType: 'user',
    entityId: entry.userId,
    shopId: entry.shopId,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}

/** The shop or region a person is to be scoped to must exist; a closed shop takes nobody new. */
async function assertScopeTargets(
  tx: Tx,
  scope: { shopId: number | null; regionId: number | null },
  changing: { shop: boolean },
) {
  if (scope.shopId !== null) {
    const [shop] = await tx
      .select({ active: shops.active })
      .from(shops)
      .where(eq(shops.id, scope.shopId));
    if (!shop) throw notFound('shop');
    if (!shop.active && changing.shop) throw conflict('This shop is closed: choose an open shop.');
  }
  if (scope.regionId !== null) {
    const [region] = await tx
      .select({ id: regions.id })
      .from(regions)
      .where(eq(regions.id, scope.regionId));
    if (!region) throw notFound('region');
  }
}

async function worksAt(tx: Tx, scope: { shopId: number | null; regionId: number | null }) {
  if (scope.shopId !== null) {
    const [s] = await tx.select({ name: shops.name }).from(shops).where(eq(shops.id, scope.shopId));
    return s?.name ?? 'a shop';
  }
  if (scope.regionId !== null) {
    const [r] = await tx
      .select({ name: regions.name })
      .from(regions)
      .where(eq(regions.id, scope.regionId));
    return r?.name ?? 'a region';
  }
  return 'the whole network';
}

async function queueInvitation(
  tx: Tx,
  person: Pick<User, 'id' | 'name' | 'email' | 'role' | 'shopId' | 'regionId'>,
  principal: Principal,
  now: Date,
) {
  const { token, expiresAt } = await issueLink(tx, {
    userId: person.id,
    purpose: 'invitation',
    createdById: principal.id,
    now,
  });
  const mail = invitationEmail({
    name: person.name,
    invitedBy: principal.name,
    roleLabel: ROLE_LABELS[person.role].toLowerCase(),
    worksAt: await worksAt(tx, person),
    link: linkUrl(token),
    expiresAt,
  });
  await queueEmail(tx, {
    kind: 'invitation',
    to: person.email,
    ...mail,
    shopId: person.shopId ?? undefined,
    entityType: 'user',
    entityId: person.id,
  });
  return expiresAt;
}

/**
 * `POST /api/users`: adds a person without a password and e-mails them a one-time link to set
 * one. An address that already has an account is a 409.
 */
export async function invitePerson(
  principal: Principal,
  input: InviteInput,
  options: { now?: Date } = {},
): Promise<PersonDetail> {
  const now = options.now ?? new Date();
  const scope = { shopId: input.shopId ?? null, regionId: input.regionId ?? null };
  const id = await (
    await db()
  ).transaction(async (tx) => {
    await assertScopeTargets(tx, scope, { shop: true });
    const [taken] = await tx
      .select({ id: users.id })
      .from(users)
      .where(eq(users.email, input.email));
    if (taken) throw conflict(`${input.email} already has an account.`);
    const [person] = await tx
      .insert(users)
      .values({
        email: input.email,
        name: input.name,
        passwordHash: null,
        role: input.role,
        ...scope,
      })
      .returning();
    const expiresAt = await queueInvitation(tx, person!, principal, now);
    await logPersonChange(tx, {
      by: principal.id,
      action: 'user.invite',
      userId: person!.id,
      shopId: scope.shopId,
      after: { name: input.name, email: input.email, role: input.role, ...scope, expiresAt },
      at: now,
    });
    return person!.id;
  });
  return getPerson(principal, id, now);
}

/** Active owners other than `exceptId`, locked so two demotions cannot both pass the check. */
async function otherActiveOwners(tx: Tx, exceptId: number): Promise<number> {
  const rows = await tx
    .select({ id: users.id })
    .from(users)
    .where(and(eq(users.role, 'owner'), eq(users.active, true), ne(users.id, exceptId)))
    .for('update');
  return rows.length;
}

/**
 * `PATCH /api/users/{id}`: name, role, shop or region, active. The role and scope are checked as
 * they would stand after the change (a new role drops the scope it has no use for). The last
 * active owner can be neither demoted nor deactivated (409). A change of role, scope or active
 * ends the person's sessions (the users trigger of migration 0004 bumps their session version).
 */
export async function updatePerson(
  principal: Principal,
  id: number,
  patch: PersonPatch,
  options: { now?: Date } = {},
): Promise<PersonDetail> {
  const now = options.now ?? new Date();
  await (
    await db()
  ).transaction(async (tx) => {
    const [before] = await tx.select().from(users).where(eq(users.id, id)).for('update');
    if (!before) throw notFound('person');
    const nextRole = patch.role ?? before.role;
    const needsShop = nextRole === 'shop_lead' || nextRole === 'technician';
    const needsRegion = nextRole === 'regional_manager';
    const next = {
      name: patch.name ?? before.name,
      role: nextRole,
      shopId: patch.shopId !== undefined ? patch.shopId : needsShop ? before.shopId : null,
      regionId:
        patch.regionId !== undefined ? patch.regionId : needsRegion ? before.regionId : null,
      active: patch.active ?? before.active,
    };
    const problem = scopeProblem(next);
    if (problem)
      throw badRequest('Some body fields are not valid.', [
        { field: `body.${problem.field}`, message: problem.message },
      ]);
    await assertScopeTargets(tx, next, { shop: next.shopId !== before.shopId });
    const losesOwner =
      before.role === 'owner' && before.active && (next.role !== 'owner' || !next.active);
    if (losesOwner && (await otherActiveOwners(tx, id)) === 0)
      throw conflict(
        'This is the last active owner: make someone else an owner before changing this account.',
      );
    const changed = (Object.keys(next) as (keyof typeof next)[]).filter(
      (k) => next[k] !== before[k],
    );
    if (changed.length === 0) return;
    await tx.update(users).set(next).where(eq(users.id, id));
    // A person who can no longer sign in keeps no pending link.
    if (!next.active) await withdrawLinks(tx, id, null, now);
    await logPersonChange(tx, {
      by: principal.id,
      action:
        patch.active === false && before.active
          ? 'user.deactivate'
          : patch.active && !before.active
            ? 'user.reactivate'
            : 'user.update',
      userId: id,
      shopId: next.shopId ?? before.shopId,
      before: Object.fromEntries(changed.map((k) => [k, before[k]])),
      after: Object.fromEntries(changed.map((k) => [k, next[k]])),
      at: now,
    });
  });
  return getPerson(principal, id, now);
}

/**
 * `POST /api/users/{id}/invite`: send a fresh invitation link (the earlier one stops working) or
 * withdraw the pending one. Only for a person who has not set a password yet (409 otherwise).
 */
export async function invitationAction(
  principal: Principal,
  id: number,
  input: InviteAction,
  options: { now?: Date } = {},
): Promise<PersonDetail> {
  const now = options.now ?? new Date();
  await (
    await db()
  ).transaction(async (tx) => {
    const [person] = await tx.select().from(users).where(eq(users.id, id)).for('update');
    if (!person) throw notFound('person');
    if (person.passwordHash !== null)
      throw conflict(
        `${person.name} has already set a password: there is no invitation to ${input.action}.`,
      );
    if (!person.active)
      throw conflict(
        `${person.name} is deactivated: reactivate them before sending an invitation.`,
      );
    if (input.action === 'resend') {
      const expiresAt = await queueInvitation(tx, person, principal, now);
      await logPersonChange(tx, {
        by: principal.id,
        action: 'user.invite_resend',
        userId: id,
        shopId: person.shopId,
        after: { expiresAt },
        at: now,
      });
    } else {
      const withdrawn = await withdrawLinks(tx, id, 'invitation', now);
      if (withdrawn === 0) throw conflict(`${person.name} has no pending invitation.`);
      await logPersonChange(tx, {
        by: principal.id,
        action: 'user.invite_withdraw',
        userId: id,
        shopId: person.shopId,
        at: now,
      });
    }
  });
  return getPerson(principal, id, now);
}
