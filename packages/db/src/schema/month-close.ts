import { sql } from 'drizzle-orm';
import { index, integer, jsonb, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { createdAt, id, instant, updatedAt } from './columns';
import { royaltyInvoiceStatus } from './enums';
import { shops } from './shops';
import { users } from './users';

/**
 * A closed month with its figures frozen. Reopening keeps the row (with the reason) and a later
 * close adds a new one, so every past close stays comparable with the live figures.
 */
export const monthCloses = pgTable(
  'month_closes',
  {
    id: id(),
    /** "YYYY-MM". */
    month: text('month').notNull(),
    /** Per-shop figures and network totals as shown at closing. */
    figures: jsonb('figures').$type<Record<string, unknown>>().notNull(),
    closedAt: instant('closed_at').notNull().defaultNow(),
    closedById: integer('closed_by_id').references(() => users.id),
    reopenedAt: instant('reopened_at'),
    reopenedById: integer('reopened_by_id').references(() => users.id),
    reopenReason: text('reopen_reason'),
    /**
     * When the owner asked for the month's royalty invoices: a queue job issues them and clears
     * nothing; the job (or the minute's sweep, if an instance died) runs while this is set and the
     * invoices are not all issued, and sets invoicesDoneAt when they are.
     */
    invoicesRequestedAt: instant('invoices_requested_at'),
    invoicesRequestedById: integer('invoices_requested_by_id').references(() => users.id),
    invoicesDoneAt: instant('invoices_done_at'),
  },
  (t) => [
    index('month_closes_month_idx').on(t.month),
    uniqueIndex('month_closes_one_open_close_per_month_uq')
      .on(t.month)
      .where(sql`${t.reopenedAt} is null`),
  ],
);
export type MonthClose = typeof monthCloses.$inferSelect;
export type NewMonthClose = typeof monthCloses.$inferInsert;

export const royaltyInvoices = pgTable(
  'royalty_invoices',
  {
    id: id(),
    monthCloseId: integer('month_close_id')
      .notNull()
      .references(() => monthCloses.id),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    /** "YYYY-MM". */
    month: text('month').notNull(),
    revenueCents: integer('revenue_cents').notNull(),
    royaltyRateBp: integer('royalty_rate_bp').notNull(),
    amountCents: integer('amount_cents').notNull(),
    currency: text('currency').notNull().default('USD'),
    status: royaltyInvoiceStatus('status').notNull().default('pending'),
    /** Sent with every provider call, so issuing twice never bills twice. */
    idempotencyKey: text('idempotency_key').notNull().unique(),
    stripeCustomerId: text('stripe_customer_id'),
    stripeInvoiceItemId: text('stripe_invoice_item_id'),
    stripeInvoiceId: text('stripe_invoice_id').unique(),
    hostedInvoiceUrl: text('hosted_invoice_url'),
    lastError: text('last_error'),
    issuedAt: instant('issued_at'),
    paidAt: instant('paid_at'),
    failedAt: instant('failed_at'),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('royalty_invoices_shop_month_uq').on(t.shopId, t.month),
    index('royalty_invoices_month_idx').on(t.month),
  ],
);
export type RoyaltyInvoice = typeof royaltyInvoices.$inferSelect;
export type NewRoyaltyInvoice = typeof royaltyInvoices.$inferInsert;

/** Webhook events already processed, so a redelivered event changes nothing. */
export const paymentEvents = pgTable('payment_events', {
  id: id(),
  providerEventId: text('provider_event_id').notNull().unique(),
  type: text('type').notNull(),
  royaltyInvoiceId: integer('royalty_invoice_id').references(() => royaltyInvoices.id),
  payload: jsonb('payload').$type<Record<string, unknown>>(),
  receivedAt: instant('received_at').notNull().defaultNow(),
  /**
   * Set when a queue job applied the event to its invoice: the webhook stores the event and
   * answers; processing happens after, once per event id however often it is delivered or run.
   */
  processedAt: instant('processed_at'),
  processAttempts: integer('process_attempts').notNull().default(0),
  lastError: text('last_error'),
});
export type PaymentEvent = typeof paymentEvents.$inferSelect;
export type NewPaymentEvent = typeof paymentEvents.$inferInsert;
