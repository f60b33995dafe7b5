import {
  boolean,
  index,
  integer,
  pgTable,
  primaryKey,
  text,
  uniqueIndex,
} from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { reelKind, stepGroup } from './enums';
import { jobs } from './jobs';
import { users } from './users';

/** A version of the network's service standard; published versions are never edited. */
export const serviceStandards = pgTable('service_standards', {
  id: id(),
  version: integer('version').notNull().unique(),
  title: text('title').notNull(),
  /** General safety notice shown above the checklist. */
  safetyNotice: text('safety_notice'),
  /** Null while a draft. */
  publishedAt: instant('published_at'),
  createdById: integer('created_by_id').references(() => users.id),
  createdAt: createdAt(),
});
export type ServiceStandard = typeof serviceStandards.$inferSelect;
export type NewServiceStandard = typeof serviceStandards.$inferInsert;

export const serviceStandardSteps = pgTable(
  'service_standard_steps',
  {
    id: id(),
    standardId: integer('standard_id')
      .notNull()
      .references(() => serviceStandards.id),
    group: stepGroup('group').notNull(),
    /** Order within the whole standard. */
    position: integer('position').notNull(),
    /** Stable across versions, e.g. "drag.washers", so findings can be compared. */
    code: text('code').notNull(),
    title: text('title').notNull(),
    instructions: text('instructions'),
    /** Shown with the step; defers to safety data sheets and local regulations. */
    safetyCaution: text('safety_caution'),
    required: boolean('required').notNull().default(true),
    /** Reel kinds the step applies to; null means all. */
    appliesTo: reelKind('applies_to').array(),
  },
  (t) => [
    uniqueIndex('service_standard_steps_standard_code_uq').on(t.standardId, t.code),
    index('service_standard_steps_standard_position_idx').on(t.standardId, t.position),
  ],
);
export type ServiceStandardStep = typeof serviceStandardSteps.$inferSelect;
export type NewServiceStandardStep = typeof serviceStandardSteps.$inferInsert;

/** One row per ticked step of a job; unticking deletes it. */
export const checklistTicks = pgTable(
  'checklist_ticks',
  {
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id, { onDelete: 'cascade' }),
    stepId: integer('step_id')
      .notNull()
      .references(() => serviceStandardSteps.id),
    userId: integer('user_id').references(() => users.id),
    tickedAt: instant('ticked_at').notNull().defaultNow(),
    note: text('note'),
  },
  // Keyed by job and step: the most numerous table, so no surrogate id and no extra index.
  (t) => [primaryKey({ columns: [t.jobId, t.stepId] })],
);
export type ChecklistTick = typeof checklistTicks.$inferSelect;
export type NewChecklistTick = typeof checklistTicks.$inferInsert;
