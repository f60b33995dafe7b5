import { and, eq, sql } from '@reelwright/db';
import {
  comebacks,
  correctiveActions,
  customers,
  emails,
  monthCloses,
  networkSettings,
  paymentEvents,
  reels,
  reminderBatches,
  royaltyInvoices,
} from '@reelwright/db/schema';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import {
  closeMemoryDb,
  openTargetDb,
  TEST_TARGET,
  testState as state,
} from '~/server/testing/memory-db';
import { resendEmail, undeliveredEmails, deliverPending, MAX_ATTEMPTS } from '../mail/outbox';
import { buildMonthCloseNetwork } from '../month-close/test-network';
import { handlePaymentWebhook, processPaymentEvents } from '../payments/webhook';
import { sendNudges } from './nudges';
import { runWeeklyReminders } from './weekly-reminders';
import Stripe from 'stripe';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

// Monday 14 December 2026: 09:00 in New York (Dune, Reef), 08:00 in Chicago (Formula).
const MONDAY_MORNING = new Date('2026-12-14T14:00:00Z');
// The same Monday at 07:00 in New York and 06:00 in Chicago: too early for the weekly run.
const MONDAY_EARLY = new Date('2026-12-14T12:00:00Z');
const BASE_URL = 'https://reelwright.test';
const SECRET = 'whsec_jobs_test_secret';
let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
let comebackId = 0;
let actionId = 0;

const conn = () => state.handle!.db;
const count = async (table: 'emails' | 'scheduled_marks' | 'reminder_batches', kind?: string) => {
  const { rows } = await conn().execute<{ n: number | string }>(
    kind
      ? sql`select count(*) as n from ${sql.identifier(table)} where kind = ${kind}`
      : sql`select count(*) as n from ${sql.identifier(table)}`,
  );
  return Number(rows[0]!.n);
};

beforeAll(async () => {
  await openTargetDb();
  net = await buildMonthCloseNetwork(conn());
  // An open comeback of Dune's, logged on 1 December: its 7-day review deadline passed on the 8th.
  const [cb] = await conn()
    .insert(comebacks)
    .values({
      jobId: net.jobs.d3.id,
      originalJobId: net.jobs.d1.id,
      originalShopId: net.shops.dune.id,
      status: 'open',
      detectedAt: new Date('2026-12-01T14:00:00Z'),
      createdAt: new Date('2026-12-01T14:00:00Z'),
      daysSinceCollection: 20,
    })
    .returning({ id: comebacks.id });
  comebackId = cb!.id;
  // The open action due on 10 December gets an owner: Dune's lead.
  const [action] = await conn()
    .update(correctiveActions)
    .set({ ownerId: net.leadDune.id })
    .where(eq(correctiveActions.title, 'Retrain drag-stack steps'))
    .returning({ id: correctiveActions.id });
  actionId = action!.id;
  // One customer of Dune's with a reel due for service within four weeks.
  const [ada] = await conn()
    .insert(customers)
    .values({
      shopId: net.shops.dune.id,
      name: 'Ada Angler',
      email: 'ada@example.test',
      reminderConsent: true,
    })
    .returning();
  await conn().insert(reels).values({
    customerId: ada!.id,
    kind: 'spinning',
    maker: 'Tidewake',
    model: 'Weekly',
    size: '3000',
    useProfile: 'light',
    lastServicedOn: '2025-12-20', // light use: due 2026-12-20, inside four weeks
  });
}, 120_000);

afterAll(async () => {
  await closeMemoryDb();
});

describe(`scheduled and queued jobs (${TEST_TARGET})`, () => {
  it('shop lead and owner – overdue items are nudged once a day however often the job runs', async () => {
    const first = await sendNudges(conn(), MONDAY_MORNING, { baseUrl: BASE_URL });
    const again = await sendNudges(conn(), MONDAY_MORNING, { baseUrl: BASE_URL });
    expect(first).toEqual({ comebacks: 1, actions: 1 });
    expect(again).toEqual({ comebacks: 0, actions: 0 });
    const nudges = await conn()
      .select({ to: emails.toAddress, subject: emails.subject, text: emails.textBody })
      .from(emails)
      .where(eq(emails.kind, 'nudge'))
      .orderBy(emails.id);
    expect(nudges.map((m) => [m.to, m.subject])).toEqual([
      ['lead.dune@t.test', `Comeback #${comebackId} is past its review deadline`],
      ['lead.dune@t.test', 'Corrective action past due: Retrain drag-stack steps'],
    ]);
    expect(nudges[0]!.text).toContain(`${BASE_URL}/comebacks/${comebackId}`);
    expect(nudges[1]!.text).toContain('was due on 2026-12-10');
    // The next day in New York, each is nudged again, once.
    const tuesday = new Date('2026-12-15T14:00:00Z');
    await Promise.all([sendNudges(conn(), tuesday), sendNudges(conn(), tuesday)]);
    expect(await count('emails', 'nudge')).toBe(4);
    expect(await count('scheduled_marks')).toBe(4);
    expect(actionId).toBeGreaterThan(0);
  });

  it('owner – the weekly reminders go out on Monday morning in each shop’s zone, once', async () => {
    expect(await runWeeklyReminders(conn(), MONDAY_EARLY, { baseUrl: BASE_URL })).toEqual({
      ran: [],
    });
    const first = await runWeeklyReminders(conn(), MONDAY_MORNING, { baseUrl: BASE_URL });
    expect(first.ran.map((r) => r.shopId).sort()).toEqual(
      [net.shops.dune.id, net.shops.formula.id, net.shops.reef.id].sort(),
    );
    expect(first.ran.find((r) => r.shopId === net.shops.dune.id)?.total).toBe(1);
    const again = await runWeeklyReminders(conn(), MONDAY_MORNING, { baseUrl: BASE_URL });
    expect(again).toEqual({ ran: [] });
    const reminders = await conn()
      .select({ to: emails.toAddress })
      .from(emails)
      .where(eq(emails.kind, 'service_reminder'));
    expect(reminders).toEqual([{ to: 'ada@example.test' }]);
    const batches = await conn()
      .select({ shopId: reminderBatches.shopId, total: reminderBatches.total })
      .from(reminderBatches);
    expect(batches).toHaveLength(3);
  });

  it('owner – with the weekly run turned off, Monday sends nothing', async () => {
    await conn()
      .update(networkSettings)
      .set({ weeklyReminders: false })
      .where(eq(networkSettings.id, 1));
    const nextMonday = new Date('2026-12-21T14:00:00Z');
    expect(await runWeeklyReminders(conn(), nextMonday, { baseUrl: BASE_URL })).toEqual({
      ran: [],
      off: true,
    });
    await conn()
      .update(networkSettings)
      .set({ weeklyReminders: true })
      .where(eq(networkSettings.id, 1));
  });

  it('provider – a webhook event is stored first and applied by the job once, however often it runs', async () => {
    const [close] = await conn()
      .insert(monthCloses)
      .values({ month: '2026-11', figures: {} })
      .returning();
    const [invoice] = await conn()
      .insert(royaltyInvoices)
      .values({
        monthCloseId: close!.id,
        shopId: net.shops.dune.id,
        month: '2026-11',
        revenueCents: 246_000,
        royaltyRateBp: 500,
        amountCents: 12_300,
        currency: 'USD',
        status: 'open',
        stripeInvoiceId: 'in_jobs_test',
        idempotencyKey: 'reelwright:royalty:2026-11:shop-test',
      })
      .returning();
    const now = new Date();
    const payload = JSON.stringify({
      id: 'evt_jobs_test',
      object: 'event',
      type: 'invoice.paid',
      created: 1_796_000_000,
      data: { object: { id: 'in_jobs_test', object: 'invoice' } },
    });
    const signature = Stripe.webhooks.generateTestHeaderString({ payload, secret: SECRET });
    const stored = await handlePaymentWebhook(conn(), payload, signature, SECRET, now);
    expect(stored).toMatchObject({ recorded: true, royaltyInvoiceId: invoice!.id });
    const redelivered = await handlePaymentWebhook(conn(), payload, signature, SECRET, now);
    expect(redelivered.recorded).toBe(false);
    const before = await conn()
      .select()
      .from(royaltyInvoices)
      .where(eq(royaltyInvoices.id, invoice!.id));
    expect(before[0]!.status).toBe('open');

    const runs = await Promise.all([
      processPaymentEvents(conn(), stored.eventId),
      processPaymentEvents(conn(), stored.eventId),
    ]);
    expect(runs.sort()).toEqual([0, 1]);
    expect(await processPaymentEvents(conn())).toBe(0);
    const [after] = await conn()
      .select()
      .from(royaltyInvoices)
      .where(eq(royaltyInvoices.id, invoice!.id));
    expect(after!.status).toBe('paid');
    expect(after!.paidAt).toEqual(new Date(1_796_000_000 * 1000));
    const [event] = await conn()
      .select()
      .from(paymentEvents)
      .where(eq(paymentEvents.providerEventId, 'evt_jobs_test'));
    expect(event!.processedAt).not.toBeNull();
  });

  it('owner – a message that keeps failing ends dead with its last error, and a resend sends it once', async () => {
    const [message] = await conn()
      .insert(emails)
      .values({
        kind: 'other',
        toAddress: 'nobody@example.test',
        subject: 'Undeliverable',
        textBody: 'Hello',
        attempts: MAX_ATTEMPTS - 1,
      })
      .returning();
    // Nothing listens on port 9: the attempt fails, and it is the last one allowed.
    await deliverPending({ db: conn(), smtpUrl: 'smtp://127.0.0.1:9' });
    const dead = await undeliveredEmails(conn());
    expect(dead.map((d) => [d.id, d.attempts])).toEqual([[message!.id, MAX_ATTEMPTS]]);
    expect(dead[0]!.lastError).toMatch(/ECONNREFUSED|connect/i);
    // No further automatic attempt.
    expect(await deliverPending({ db: conn(), smtpUrl: 'smtp://127.0.0.1:9' })).toMatchObject({
      failed: 0,
    });
    const resent = await Promise.all([
      resendEmail(conn(), message!.id),
      resendEmail(conn(), message!.id),
    ]);
    expect(resent.sort()).toEqual([false, true]);
    const [row] = await conn()
      .select({ status: emails.status, attempts: emails.attempts })
      .from(emails)
      .where(and(eq(emails.id, message!.id)));
    expect(row).toEqual({ status: 'pending', attempts: 0 });
    expect(await count('scheduled_marks', 'weekly_reminders')).toBe(3);
  });
});
