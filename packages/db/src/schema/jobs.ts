import { sql } from 'drizzle-orm';
import {
  check,
  index,
  integer,
  pgTable,
  text,
  uniqueIndex,
  type AnyPgColumn,
} from 'drizzle-orm/pg-core';
import { createdAt, id, instant, updatedAt } from './columns';
import { customers, reels } from './customers';
import { jobState, serviceType } from './enums';
import { importBatches } from './imports';
import { shops } from './shops';
import { serviceStandards } from './standards';
import { users } from './users';

export const jobs = pgTable(
  'jobs',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    customerId: integer('customer_id')
      .notNull()
      .references(() => customers.id),
    reelId: integer('reel_id')
      .notNull()
      .references(() => reels.id),
    serviceType: serviceType('service_type').notNull(),
    state: jobState('state').notNull().default('checked_in'),
    /** When the current state was entered; drives ageing and "waiting longer than N days". */
    stateChangedAt: instant('state_changed_at').notNull().defaultNow(),
    technicianId: integer('technician_id').references(() => users.id),
    /** Standard version the job was checked in under; its checklist is ticked against it. */
    serviceStandardId: integer('service_standard_id').references(() => serviceStandards.id),
    complaint: text('complaint'),
    condition: text('condition'),
    findings: text('findings'),
    checkedInAt: instant('checked_in_at').notNull(),
    promisedAt: instant('promised_at'),
    readyAt: instant('ready_at'),
    collectedAt: instant('collected_at'),
    labourCents: integer('labour_cents').notNull().default(0),
    partsCents: integer('parts_cents').notNull().default(0),
    discountCents: integer('discount_cents').notNull().default(0),
    /** The earlier job this one is a return of (set when a comeback is flagged or linked). */
    comebackOfJobId: integer('comeback_of_job_id').references((): AnyPgColumn => jobs.id),
    /** Why the job was marked ready with required checklist steps unticked. */
    incompleteChecklistReason: text('incomplete_checklist_reason'),
    // Business-time figures, computed by @reelwright/metrics when the job becomes ready (and
    // again when the shop's calendar changes) so that SQL can aggregate them.
    customerTurnaroundMinutes: integer('customer_turnaround_minutes'),
    benchTurnaroundMinutes: integer('bench_turnaround_minutes'),
    waitingPartsMinutes: integer('waiting_parts_minutes'),
    /** Total logged bench time. */
    benchMinutes: integer('bench_minutes'),
    importBatchId: integer('import_batch_id').references(() => importBatches.id),
    /** The job's id in the system it was imported from. */
    externalRef: text('external_ref'),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    // The network comparison reads a period's ready jobs from this index alone (index-only scan);
    // it also serves every other lookup by shop and ready_at.
    index('jobs_shop_ready_figures_idx').on(
      t.shopId,
      t.readyAt,
      t.promisedAt,
      t.customerTurnaroundMinutes,
      t.benchTurnaroundMinutes,
      t.labourCents,
      t.partsCents,
      t.discountCents,
      t.benchMinutes,
    ),
    index('jobs_shop_checked_in_at_idx').on(t.shopId, t.checkedInAt),
    index('jobs_shop_state_idx').on(t.shopId, t.state),
    // With the id, a period's collected jobs meet their comebacks in a hash join read from this
    // index alone instead of one primary-key lookup per comeback (the network comparison).
    index('jobs_shop_collected_at_idx').on(t.shopId, t.collectedAt, t.id),
    index('jobs_reel_id_idx').on(t.reelId),
    index('jobs_customer_id_idx').on(t.customerId),
    index('jobs_technician_id_idx').on(t.technicianId),
    index('jobs_comeback_of_job_id_idx').on(t.comebackOfJobId),
    index('jobs_import_batch_id_idx')
      .on(t.importBatchId)
      .where(sql`${t.importBatchId} is not null`),
    uniqueIndex('jobs_shop_external_ref_uq').on(t.shopId, t.externalRef),
    check(
      'jobs_money_nonnegative',
      sql`${t.labourCents} >= 0 and ${t.partsCents} >= 0 and ${t.discountCents} >= 0`,
    ),
    check(
      'jobs_state_times',
      sql`(${t.state} not in ('ready', 'collected') or ${t.readyAt} is not null)
        and (${t.state} <> 'collected' or ${t.collectedAt} is not null)`,
    ),
    // Seven digits (19 years of minutes): shop_month_figures lists turnarounds at a fixed width.
    check(
      'jobs_turnaround_range',
      sql`${t.customerTurnaroundMinutes} between 0 and 9999999
        and ${t.benchTurnaroundMinutes} between 0 and 9999999`,
    ),
    check(
      'jobs_not_own_comeback',
      sql`${t.comebackOfJobId} is null or ${t.comebackOfJobId} <> ${t.id}`,
    ),
  ],
);
export type Job = typeof jobs.$inferSelect;
export type NewJob = typeof jobs.$inferInsert;

/** The job's timeline: one row per state change (the first has no fromState). */
export const jobEvents = pgTable(
  'job_events',
  {
    id: id(),
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    fromState: jobState('from_state'),
    toState: jobState('to_state').notNull(),
    at: instant('at').notNull(),
    /** Null only for rows written by an import or the system. */
    userId: integer('user_id').references(() => users.id),
    note: text('note'),
  },
  (t) => [index('job_events_job_id_at_idx').on(t.jobId, t.at)],
);
export type JobEvent = typeof jobEvents.$inferSelect;
export type NewJobEvent = typeof jobEvents.$inferInsert;

export const benchSessions = pgTable(
  'bench_sessions',
  {
    id: id(),
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    technicianId: integer('technician_id')
      .notNull()
      .references(() => users.id),
    /** Timer sessions have a start (and an end once stopped); manual entries have neither. */
    startedAt: instant('started_at'),
    endedAt: instant('ended_at'),
    /** Set when stopped or entered by hand; null while the timer runs. */
    minutes: integer('minutes'),
    note: text('note'),
    createdAt: createdAt(),
  },
  (t) => [
    index('bench_sessions_job_id_idx').on(t.jobId),
    index('bench_sessions_technician_started_at_idx').on(t.technicianId, t.startedAt),
    // One running timer per technician.
    uniqueIndex('bench_sessions_one_running_per_technician_uq')
      .on(t.technicianId)
      .where(sql`${t.startedAt} is not null and ${t.endedAt} is null`),
    check(
      'bench_sessions_shape',
      sql`(${t.startedAt} is null and ${t.endedAt} is null and ${t.minutes} is not null)
        or (${t.startedAt} is not null and ${t.endedAt} is null and ${t.minutes} is null)
        or (${t.startedAt} is not null and ${t.endedAt} is not null and ${t.endedAt} >= ${t.startedAt} and ${t.minutes} is not null)`,
    ),
    check('bench_sessions_minutes_nonnegative', sql`${t.minutes} >= 0`),
  ],
);
export type BenchSession = typeof benchSessions.$inferSelect;
export type NewBenchSession = typeof benchSessions.$inferInsert;

export const partLines = pgTable(
  'part_lines',
  {
    id: id(),
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    partNumber: text('part_number'),
    quantity: integer('quantity').notNull().default(1),
    unitPriceCents: integer('unit_price_cents').notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    index('part_lines_job_id_idx').on(t.jobId),
    check('part_lines_quantity_positive', sql`${t.quantity} > 0`),
    check('part_lines_unit_price_nonnegative', sql`${t.unitPriceCents} >= 0`),
  ],
);
export type PartLine = typeof partLines.$inferSelect;
export type NewPartLine = typeof partLines.$inferInsert;
