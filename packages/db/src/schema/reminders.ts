import { date, index, integer, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { customers, reels } from './customers';
import { reminderBatchStatus } from './enums';
import { emails } from './mail';
import { shops } from './shops';
import { users } from './users';

export const reminderBatches = pgTable(
  'reminder_batches',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    createdById: integer('created_by_id').references(() => users.id),
    status: reminderBatchStatus('status').notNull().default('running'),
    total: integer('total').notNull().default(0),
    sent: integer('sent').notNull().default(0),
    skipped: integer('skipped').notNull().default(0),
    failed: integer('failed').notNull().default(0),
    createdAt: createdAt(),
    completedAt: instant('completed_at'),
  },
  (t) => [index('reminder_batches_shop_created_at_idx').on(t.shopId, t.createdAt)],
);
export type ReminderBatch = typeof reminderBatches.$inferSelect;
export type NewReminderBatch = typeof reminderBatches.$inferInsert;

/** One row per reminder sent: the unique (reel, due date) means a reminder never goes twice. */
export const remindersSent = pgTable(
  'reminders_sent',
  {
    id: id(),
    batchId: integer('batch_id').references(() => reminderBatches.id),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    customerId: integer('customer_id')
      .notNull()
      .references(() => customers.id),
    reelId: integer('reel_id')
      .notNull()
      .references(() => reels.id),
    /** The service-due date the reminder is for. */
    dueOn: date('due_on', { mode: 'string' }).notNull(),
    emailId: integer('email_id').references(() => emails.id),
    sentAt: instant('sent_at').notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('reminders_sent_reel_due_on_uq').on(t.reelId, t.dueOn),
    index('reminders_sent_shop_sent_at_idx').on(t.shopId, t.sentAt),
    index('reminders_sent_customer_id_idx').on(t.customerId),
  ],
);
export type ReminderSent = typeof remindersSent.$inferSelect;
export type NewReminderSent = typeof remindersSent.$inferInsert;

export const unsubscribeTokens = pgTable(
  'unsubscribe_tokens',
  {
    id: id(),
    customerId: integer('customer_id')
      .notNull()
      .references(() => customers.id),
    /** Random, URL-safe; the link in every reminder. */
    token: text('token').notNull().unique(),
    createdAt: createdAt(),
    usedAt: instant('used_at'),
  },
  (t) => [index('unsubscribe_tokens_customer_id_idx').on(t.customerId)],
);
export type UnsubscribeToken = typeof unsubscribeTokens.$inferSelect;
export type NewUnsubscribeToken = typeof unsubscribeTokens.$inferInsert;
