import { boolean, index, integer, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { createdAt, id, instant, updatedAt } from './columns';
import {
  comebackAttribution,
  comebackDetection,
  comebackDisposition,
  comebackStatus,
} from './enums';
import { jobs } from './jobs';
import { shops } from './shops';
import { serviceStandardSteps } from './standards';
import { users } from './users';

/** The owner's short list of root causes. */
export const rootCauses = pgTable('root_causes', {
  id: id(),
  code: text('code').notNull().unique(),
  label: text('label').notNull(),
  position: integer('position').notNull().default(0),
  active: boolean('active').notNull().default(true),
  createdAt: createdAt(),
});
export type RootCause = typeof rootCauses.$inferSelect;
export type NewRootCause = typeof rootCauses.$inferInsert;

export const comebacks = pgTable(
  'comebacks',
  {
    id: id(),
    /** The return job. */
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id),
    /** The job whose work came back. */
    originalJobId: integer('original_job_id')
      .notNull()
      .references(() => jobs.id),
    /** The shop that did the original work owns the review, wherever the reel returned. */
    originalShopId: integer('original_shop_id')
      .notNull()
      .references(() => shops.id),
    status: comebackStatus('status').notNull().default('open'),
    detection: comebackDetection('detection').notNull().default('automatic'),
    /** What the customer reports this time. */
    symptom: text('symptom'),
    attribution: comebackAttribution('attribution'),
    rootCauseId: integer('root_cause_id').references(() => rootCauses.id),
    rootCauseNote: text('root_cause_note'),
    checklistStepId: integer('checklist_step_id').references(() => serviceStandardSteps.id),
    disposition: comebackDisposition('disposition'),
    /** Bench time and parts of the return job, in cents. */
    redoCostCents: integer('redo_cost_cents'),
    dismissReason: text('dismiss_reason'),
    /** Who the review is assigned to when a manager reassigns it; null means the shop lead. */
    assigneeId: integer('assignee_id').references(() => users.id),
    reviewerId: integer('reviewer_id').references(() => users.id),
    detectedAt: instant('detected_at').notNull(),
    /**
     * The original job's collected_at, copied by the triggers of migration 0003 (on insert, and
     * whenever that job's collection time changes), so that a period's comebacks are counted from
     * this table's index alone. Never written by the application.
     */
    originalCollectedAt: instant('original_collected_at'),
    /** When the original shop's lead was e-mailed. */
    notifiedAt: instant('notified_at'),
    reviewedAt: instant('reviewed_at'),
    /** Whole days from the original job's collection to the return check-in. */
    daysSinceCollection: integer('days_since_collection').notNull(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex('comebacks_job_id_uq').on(t.jobId),
    index('comebacks_original_job_id_idx').on(t.originalJobId),
    index('comebacks_original_shop_status_idx').on(t.originalShopId, t.status),
    index('comebacks_original_shop_detected_at_idx').on(t.originalShopId, t.detectedAt),
    // The network comparison's comebacks of jobs collected in a period, read from the index alone.
    index('comebacks_original_shop_collected_idx').on(
      t.originalShopId,
      t.originalCollectedAt,
      t.detectedAt,
      t.originalJobId,
      t.status,
      t.attribution,
    ),
  ],
);
export type Comeback = typeof comebacks.$inferSelect;
export type NewComeback = typeof comebacks.$inferInsert;
