import { date, index, integer, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { emailKind, emailStatus } from './enums';
import { jobs } from './jobs';
import { shops } from './shops';

/** Outbox of e-mail: written with the change that causes it, sent and retried apart from it. */
export const emails = pgTable(
  'emails',
  {
    id: id(),
    kind: emailKind('kind').notNull(),
    toAddress: text('to_address').notNull(),
    fromAddress: text('from_address'),
    subject: text('subject').notNull(),
    textBody: text('text_body').notNull(),
    htmlBody: text('html_body'),
    status: emailStatus('status').notNull().default('pending'),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    nextAttemptAt: instant('next_attempt_at').notNull().defaultNow(),
    sentAt: instant('sent_at'),
    /** SMTP Message-ID returned on sending. */
    messageId: text('message_id'),
    shopId: integer('shop_id').references(() => shops.id),
    jobId: integer('job_id').references(() => jobs.id),
    /** What the e-mail is about, e.g. "comeback" / 12, for links and de-duplication. */
    entityType: text('entity_type'),
    entityId: integer('entity_id'),
    /**
     * For a message a customer can opt out of (a service reminder): the one-click opt-out URL
     * sent as `List-Unsubscribe` with `List-Unsubscribe-Post` (RFC 8058).
     */
    listUnsubscribeUrl: text('list_unsubscribe_url'),
    createdAt: createdAt(),
  },
  (t) => [
    index('emails_status_next_attempt_idx').on(t.status, t.nextAttemptAt),
    index('emails_job_id_idx').on(t.jobId),
    index('emails_entity_idx').on(t.entityType, t.entityId),
  ],
);
export type Email = typeof emails.$inferSelect;
export type NewEmail = typeof emails.$inferInsert;

/**
 * What a scheduled job has done for one item on one day (a nudge about a comeback or a corrective
 * action, a shop's weekly reminder run): the unique key makes a second run, on another instance or
 * after a retry, find the mark taken and do nothing, so each happens at most once a day.
 */
export const scheduledMarks = pgTable(
  'scheduled_marks',
  {
    id: id(),
    /** 'comeback_nudge' | 'action_nudge' | 'weekly_reminders'. */
    kind: text('kind').notNull(),
    entityId: integer('entity_id').notNull(),
    /** The local date (of the shop) the mark is for. */
    onDate: date('on_date', { mode: 'string' }).notNull(),
    emailId: integer('email_id').references(() => emails.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('scheduled_marks_kind_entity_date_key').on(t.kind, t.entityId, t.onDate)],
);
export type ScheduledMark = typeof scheduledMarks.$inferSelect;
