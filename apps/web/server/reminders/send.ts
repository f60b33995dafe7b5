import { and, desc, eq, gte, isNull, sql, type Db, type Tx } from '@reelwright/db';
import {
  activityLog,
  customers,
  reminderBatches,
  remindersSent,
  unsubscribeTokens,
  users,
  type ReminderBatch,
} from '@reelwright/db/schema';
import { randomBytes } from 'node:crypto';
import { db } from '../db';
import { notFound } from '../errors';
import { queueEmail } from '../mail/outbox';
import type { Principal } from '../principal';
import { dueReminders, reminderShop, type DueReel, type DueShop } from './due';
import { serviceReminderEmail } from './template';
import * as clock from '~/server/clock';

/** A batch still "running" after this long was interrupted (a restart): a new one may start. */
const STALE_MS = 10 * 60_000;

export interface BatchView {
  id: number;
  shopId: number;
  status: ReminderBatch['status'];
  total: number;
  sent: number;
  skipped: number;
  failed: number;
  createdAt: Date;
  completedAt: Date | null;
  createdBy: string | null;
}

const batchColumns = {
  id: reminderBatches.id,
  shopId: reminderBatches.shopId,
  status: reminderBatches.status,
  total: reminderBatches.total,
  sent: reminderBatches.sent,
  skipped: reminderBatches.skipped,
  failed: reminderBatches.failed,
  createdAt: reminderBatches.createdAt,
  completedAt: reminderBatches.completedAt,
  createdBy: users.name,
};

export interface StartedBatch {
  batch: BatchView;
  /** True when a batch for the shop was already running and is returned instead of a new one. */
  alreadyRunning: boolean;
  items: DueReel[];
  shop: DueShop;
}

/**
 * Starts a reminder batch for the shop: the due reels whose customer consented and has an e-mail
 * address, not yet reminded for that due date. The batch row carries the progress; `runBatch` does
 * the sending. While one batch of the shop runs, starting again returns it.
 */
export async function startReminderBatch(
  principal: Principal,
  input: { shopId: number; weeks: number },
  options: { now?: Date } = {},
): Promise<StartedBatch> {
  const now = options.now ?? clock.now();
  const conn = await db();
  const shop = await reminderShop(conn, principal, input.shopId);
  const [running] = await conn
    .select(batchColumns)
    .from(reminderBatches)
    .leftJoin(users, eq(users.id, reminderBatches.createdById))
    .where(
      and(
        eq(reminderBatches.shopId, shop.id),
        eq(reminderBatches.status, 'running'),
        gte(reminderBatches.createdAt, new Date(now.getTime() - STALE_MS)),
      ),
    )
    .limit(1);
  if (running) return { batch: running, alreadyRunning: true, items: [], shop };
  const report = await dueReminders(principal, shop.id, input.weeks, { now, conn });
  const items = report.reels.filter((r) => r.reminder === 'to_send');
  const [row] = await conn
    .insert(reminderBatches)
    .values({
      shopId: shop.id,
      createdById: principal.id,
      status: items.length ? 'running' : 'done',
      total: items.length,
      createdAt: now,
      completedAt: items.length ? null : now,
    })
    .returning({ id: reminderBatches.id });
  await conn.insert(activityLog).values({
    at: now,
    userId: principal.id,
    action: 'reminders.send',
    entityType: 'reminder_batch',
    entityId: row!.id,
    shopId: shop.id,
    after: { weeks: input.weeks, total: items.length },
  });
  return { batch: await getBatch(principal, row!.id), alreadyRunning: false, items, shop };
}

async function unsubscribeToken(tx: Tx, customerId: number): Promise<string> {
  const [existing] = await tx
    .select({ token: unsubscribeTokens.token })
    .from(unsubscribeTokens)
    .where(and(eq(unsubscribeTokens.customerId, customerId), isNull(unsubscribeTokens.usedAt)))
    .orderBy(desc(unsubscribeTokens.id))
    .limit(1);
  if (existing) return existing.token;
  const token = randomBytes(24).toString('base64url');
  await tx.insert(unsubscribeTokens).values({ customerId, token });
  return token;
}

type Outcome = 'sent' | 'skipped' | 'failed';

/**
 * Sends one reminder: inside one transaction the (reel, due date) is claimed in reminders_sent —
 * whose unique key means a second batch, or a second click, finds it taken and skips — and the
 * e-mail is queued in the outbox with the customer's unsubscribe link. Consent is read again here,
 * so a customer who unsubscribed since the list was drawn is skipped.
 */
async function sendOne(
  conn: Db,
  batchId: number,
  shop: DueShop,
  item: DueReel,
  baseUrl: string,
  now: Date,
): Promise<Outcome> {
  return conn.transaction(async (tx) => {
    const [customer] = await tx
      .select({ consent: customers.reminderConsent, email: customers.email, name: customers.name })
      .from(customers)
      .where(eq(customers.id, item.customer.id))
      .for('update');
    if (!customer?.consent || !customer.email) return 'skipped';
    const [claim] = await tx
      .insert(remindersSent)
      .values({
        batchId,
        shopId: shop.id,
        customerId: item.customer.id,
        reelId: item.reelId,
        dueOn: item.dueOn,
        sentAt: now,
      })
      .onConflictDoNothing({ target: [remindersSent.reelId, remindersSent.dueOn] })
      .returning({ id: remindersSent.id });
    if (!claim) return 'skipped';
    const token = await unsubscribeToken(tx, item.customer.id);
    const base = baseUrl.replace(/\/$/, '');
    const message = serviceReminderEmail({
      shopName: shop.name,
      customerName: customer.name,
      reel: item.reel,
      lastServicedOn: item.lastServicedOn,
      dueOn: item.dueOn,
      useProfile: item.useProfile,
      unsubscribeUrl: `${base}/unsubscribe/${token}`,
      shopPhone: shop.phone,
      shopEmail: shop.email,
    });
    const emailId = await queueEmail(tx, {
      kind: 'service_reminder',
      to: customer.email,
      subject: message.subject,
      text: message.text,
      html: message.html,
      shopId: shop.id,
      entityType: 'reminder',
      entityId: claim.id,
      // Mail clients post here for their own "unsubscribe" button (RFC 8058 one-click).
      listUnsubscribeUrl: `${base}/api/unsubscribe/${token}`,
    });
    await tx.update(remindersSent).set({ emailId }).where(eq(remindersSent.id, claim.id));
    return 'sent';
  });
}

/** Works through a started batch, recording progress on the batch row after every reminder. */
export async function runBatch(
  started: StartedBatch,
  options: { baseUrl: string; now?: Date },
): Promise<void> {
  if (started.alreadyRunning || !started.items.length) return;
  const conn = await db();
  const now = options.now ?? clock.now();
  const id = started.batch.id;
  try {
    for (const item of started.items) {
      let outcome: Outcome;
      try {
        outcome = await sendOne(conn, id, started.shop, item, options.baseUrl, now);
      } catch (error) {
        console.error(
          '[reminders] one reminder failed:',
          error instanceof Error ? error.message : error,
        );
        outcome = 'failed';
      }
      await conn
        .update(reminderBatches)
        .set({ [outcome]: sql`${reminderBatches[outcome]} + 1` })
        .where(eq(reminderBatches.id, id));
    }
    await conn
      .update(reminderBatches)
      .set({ status: 'done', completedAt: clock.now() })
      .where(eq(reminderBatches.id, id));
  } catch (error) {
    await conn
      .update(reminderBatches)
      .set({ status: 'failed', completedAt: clock.now() })
      .where(eq(reminderBatches.id, id));
    throw error;
  }
}

/** One batch of a shop in the caller's scope (404 otherwise). */
export async function getBatch(principal: Principal, id: number): Promise<BatchView> {
  const conn = await db();
  const [batch] = await conn
    .select(batchColumns)
    .from(reminderBatches)
    .leftJoin(users, eq(users.id, reminderBatches.createdById))
    .where(eq(reminderBatches.id, id));
  if (!batch) throw notFound('reminder batch');
  await reminderShop(conn, principal, batch.shopId).catch(() => {
    throw notFound('reminder batch');
  });
  return batch;
}

/** The shop's latest batches, newest first. */
export async function recentBatches(
  principal: Principal,
  shopId: number,
  limit = 10,
): Promise<BatchView[]> {
  const conn = await db();
  await reminderShop(conn, principal, shopId);
  return conn
    .select(batchColumns)
    .from(reminderBatches)
    .leftJoin(users, eq(users.id, reminderBatches.createdById))
    .where(eq(reminderBatches.shopId, shopId))
    .orderBy(desc(reminderBatches.createdAt), desc(reminderBatches.id))
    .limit(limit);
}
