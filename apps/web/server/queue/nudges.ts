import { and, eq, inArray, isNull, lt, sql, type Db } from '@reelwright/db';
import {
  comebacks,
  correctiveActions,
  networkSettings,
  scheduledMarks,
  shops,
  users,
} from '@reelwright/db/schema';
import { localToday } from '../reminders/due';
import { queueEmail } from '../mail/outbox';

const DAY_MS = 86_400_000;

export interface NudgeResult {
  comebacks: number;
  actions: number;
}

interface Recipient {
  name: string;
  email: string;
}

/**
 * Nudges about overdue work: each comeback still open past its review deadline goes to its
 * reviewer, or else the original shop's leads; each corrective action open past its due date
 * (in the shop's zone) goes to its owner. A nudge claims a mark for (item, the shop's local date)
 * in the transaction that queues its e-mail, so however often the job runs, and on however many
 * instances, an item is nudged at most once a day.
 */
export async function sendNudges(
  conn: Db,
  now: Date,
  options: { baseUrl?: string | null } = {},
): Promise<NudgeResult> {
  const result: NudgeResult = { comebacks: 0, actions: 0 };
  const base = options.baseUrl?.replace(/\/$/, '') ?? null;
  const [settings] = await conn
    .select({ days: networkSettings.reviewDeadlineDays })
    .from(networkSettings)
    .where(eq(networkSettings.id, 1));
  const deadlineDays = settings?.days ?? 7;
  const overdueComebacks = await conn
    .select({
      id: comebacks.id,
      shopId: comebacks.originalShopId,
      shopName: shops.name,
      timeZone: shops.timeZone,
      reviewerId: comebacks.reviewerId,
      createdAt: comebacks.createdAt,
    })
    .from(comebacks)
    .innerJoin(shops, eq(shops.id, comebacks.originalShopId))
    .where(
      and(
        eq(comebacks.status, 'open'),
        isNull(comebacks.reviewedAt),
        lt(comebacks.createdAt, new Date(now.getTime() - deadlineDays * DAY_MS)),
      ),
    )
    .orderBy(comebacks.id);
  for (const cb of overdueComebacks) {
    const recipients: Recipient[] = await conn
      .select({ name: users.name, email: users.email })
      .from(users)
      .where(
        and(
          eq(users.active, true),
          cb.reviewerId
            ? eq(users.id, cb.reviewerId)
            : and(eq(users.role, 'shop_lead'), eq(users.shopId, cb.shopId)),
        ),
      );
    const overdueDays = Math.floor(
      (now.getTime() - cb.createdAt.getTime() - deadlineDays * DAY_MS) / DAY_MS,
    );
    const link = base ? `\n\n${base}/comebacks/${cb.id}` : '';
    const sent = await nudgeOnce(conn, {
      kind: 'comeback_nudge',
      entityId: cb.id,
      onDate: localToday(now, cb.timeZone),
      shopId: cb.shopId,
      recipients,
      entityType: 'comeback',
      subject: `Comeback #${cb.id} is past its review deadline`,
      text: (name) =>
        `Hello ${name},\n\nComeback #${cb.id} of ${cb.shopName} is still open, ${
          overdueDays > 0 ? `${overdueDays} day(s) ` : ''
        }past its ${deadlineDays}-day review deadline. Confirm or dismiss it, and record the root cause.${link}\n`,
    });
    if (sent) result.comebacks += 1;
  }

  const openActions = await conn
    .select({
      id: correctiveActions.id,
      title: correctiveActions.title,
      dueOn: correctiveActions.dueOn,
      shopId: correctiveActions.shopId,
      shopName: shops.name,
      timeZone: shops.timeZone,
      ownerName: users.name,
      ownerEmail: users.email,
      ownerActive: users.active,
    })
    .from(correctiveActions)
    .innerJoin(shops, eq(shops.id, correctiveActions.shopId))
    .innerJoin(users, eq(users.id, correctiveActions.ownerId))
    .where(inArray(correctiveActions.status, ['open', 'in_progress']))
    .orderBy(correctiveActions.id);
  for (const action of openActions) {
    const today = localToday(now, action.timeZone);
    // Due on a local date: past due from the day after it, in the shop's zone.
    if (!(action.dueOn < today) || !action.ownerActive) continue;
    const link = base ? `\n\n${base}/corrective-actions/${action.id}` : '';
    const sent = await nudgeOnce(conn, {
      kind: 'action_nudge',
      entityId: action.id,
      onDate: today,
      shopId: action.shopId,
      recipients: [{ name: action.ownerName, email: action.ownerEmail }],
      entityType: 'corrective_action',
      subject: `Corrective action past due: ${action.title}`,
      text: (name) =>
        `Hello ${name},\n\nThe corrective action “${action.title}” at ${action.shopName} was due on ${action.dueOn} and is not done yet. Finish it, or agree a new date with the owner.${link}\n`,
    });
    if (sent) result.actions += 1;
  }
  return result;
}

async function nudgeOnce(
  conn: Db,
  nudge: {
    kind: 'comeback_nudge' | 'action_nudge';
    entityId: number;
    onDate: string;
    shopId: number;
    entityType: string;
    recipients: Recipient[];
    subject: string;
    text: (name: string) => string;
  },
): Promise<boolean> {
  if (nudge.recipients.length === 0) return false;
  return conn.transaction(async (tx) => {
    const [mark] = await tx
      .insert(scheduledMarks)
      .values({ kind: nudge.kind, entityId: nudge.entityId, onDate: nudge.onDate })
      .onConflictDoNothing()
      .returning({ id: scheduledMarks.id });
    if (!mark) return false;
    let first: number | null = null;
    for (const person of nudge.recipients) {
      const id = await queueEmail(tx, {
        kind: 'nudge',
        to: person.email,
        subject: nudge.subject,
        text: nudge.text(person.name),
        shopId: nudge.shopId,
        entityType: nudge.entityType,
        entityId: nudge.entityId,
      });
      first ??= id;
    }
    await tx.update(scheduledMarks).set({ emailId: first }).where(eq(scheduledMarks.id, mark.id));
    return true;
  });
}

/** How many marks of a kind exist (tests and the owner's overview). */
export async function markCount(conn: Db, kind: string): Promise<number> {
  const { rows } = await conn.execute<{ n: number | string }>(
    sql`select count(*) as n from ${scheduledMarks} where ${scheduledMarks.kind} = ${kind}`,
  );
  return Number(rows[0]?.n ?? 0);
}
