import { sql } from 'drizzle-orm';
import { boolean, check, integer, numeric, pgTable, text } from 'drizzle-orm/pg-core';
import { id, updatedAt } from './columns';
import { comebackAttribution, inspectionLevel } from './enums';
import { users } from './users';

/** The owner's network-wide settings: a single row with id 1. */
export const networkSettings = pgTable(
  'network_settings',
  {
    id: id(),
    networkName: text('network_name').notNull(),
    /** Days after collection in which a return counts as a comeback. */
    warrantyDays: integer('warranty_days').notNull().default(90),
    /** Attributions that count in the comeback rate. */
    countedAttributions: comebackAttribution('counted_attributions')
      .array()
      .notNull()
      .default(['workmanship', 'part_failure']),
    /**
     * Months before a period whose jobs make the network's reference curve (the cumulative hazard
     * of a counted comeback by days since collection) for comparing periods with windows open.
     */
    comebackReferenceMonths: integer('comeback_reference_months').notNull().default(12),
    reviewDeadlineDays: integer('review_deadline_days').notNull().default(7),
    defaultAql: numeric('default_aql', { precision: 7, scale: 3, mode: 'number' })
      .notNull()
      .default(2.5),
    defaultInspectionLevel: inspectionLevel('default_inspection_level').notNull().default('II'),
    /** Audit score at or above which a sample meets the standard (absent a critical miss). */
    auditPassMark: integer('audit_pass_mark').notNull().default(85),
    correctiveActionDueDays: integer('corrective_action_due_days').notNull().default(14),
    /**
     * Whether each shop's service reminders go out by themselves on Monday morning in the shop's
     * time zone (the weekly run on the job queue); off, they are sent only by hand.
     */
    weeklyReminders: boolean('weekly_reminders').notNull().default(true),
    /** ISO 4217 code of all money amounts. */
    currency: text('currency').notNull().default('USD'),
    updatedById: integer('updated_by_id').references(() => users.id),
    updatedAt: updatedAt(),
  },
  (t) => [
    check('network_settings_single_row', sql`${t.id} = 1`),
    check('network_settings_warranty_days_positive', sql`${t.warrantyDays} > 0`),
    check(
      'network_settings_reference_months_range',
      sql`${t.comebackReferenceMonths} between 1 and 36`,
    ),
    check('network_settings_pass_mark_range', sql`${t.auditPassMark} between 0 and 100`),
  ],
);
export type NetworkSettings = typeof networkSettings.$inferSelect;
export type NewNetworkSettings = typeof networkSettings.$inferInsert;
