import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  date,
  index,
  integer,
  jsonb,
  numeric,
  pgTable,
  text,
  uniqueIndex,
} from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import {
  auditAnswerResult,
  auditRoundStatus,
  auditVerdict,
  inspectionLevel,
  inspectionSeverity,
  lotDecision,
} from './enums';
import { jobs } from './jobs';
import { shops } from './shops';
import { users } from './users';

/** A version of the audit form; a new version never changes audits already scored. */
export const auditForms = pgTable('audit_forms', {
  id: id(),
  version: integer('version').notNull().unique(),
  title: text('title').notNull(),
  publishedAt: instant('published_at'),
  createdById: integer('created_by_id').references(() => users.id),
  createdAt: createdAt(),
});
export type AuditForm = typeof auditForms.$inferSelect;
export type NewAuditForm = typeof auditForms.$inferInsert;

export const auditFormItems = pgTable(
  'audit_form_items',
  {
    id: id(),
    formId: integer('form_id')
      .notNull()
      .references(() => auditForms.id),
    position: integer('position').notNull(),
    code: text('code').notNull(),
    title: text('title').notNull(),
    guidance: text('guidance'),
    weight: integer('weight').notNull(),
    /** A failed critical item makes the verdict a critical miss whatever the score. */
    critical: boolean('critical').notNull().default(false),
  },
  (t) => [
    uniqueIndex('audit_form_items_form_code_uq').on(t.formId, t.code),
    check('audit_form_items_weight_positive', sql`${t.weight} > 0`),
  ],
);
export type AuditFormItem = typeof auditFormItems.$inferSelect;
export type NewAuditFormItem = typeof auditFormItems.$inferInsert;

export const auditRounds = pgTable(
  'audit_rounds',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    formId: integer('form_id')
      .notNull()
      .references(() => auditForms.id),
    /** Local dates, inclusive; the lot is the shop's jobs that became ready in them. */
    periodStart: date('period_start', { mode: 'string' }).notNull(),
    periodEnd: date('period_end', { mode: 'string' }).notNull(),
    status: auditRoundStatus('status').notNull().default('planned'),
    severity: inspectionSeverity('severity').notNull(),
    aql: numeric('aql', { precision: 7, scale: 3, mode: 'number' }).notNull(),
    inspectionLevel: inspectionLevel('inspection_level').notNull().default('II'),
    lotSize: integer('lot_size').notNull(),
    codeLetter: text('code_letter').notNull(),
    sampleSize: integer('sample_size').notNull(),
    acceptNumber: integer('accept_number').notNull(),
    rejectNumber: integer('reject_number').notNull(),
    /** Seed of the sample draw, so anyone can redraw the same sample. */
    seed: text('seed').notNull(),
    /** The lot's job ids in the stated order the draw was made from. */
    lotJobIds: jsonb('lot_job_ids').$type<number[]>().notNull(),
    /** The plan as computed, for the report (standard table, switching state). */
    plan: jsonb('plan').$type<Record<string, unknown>>(),
    auditorId: integer('auditor_id').references(() => users.id),
    plannedById: integer('planned_by_id')
      .notNull()
      .references(() => users.id),
    plannedAt: instant('planned_at').notNull().defaultNow(),
    failures: integer('failures'),
    decision: lotDecision('decision'),
    decidedAt: instant('decided_at'),
    createdAt: createdAt(),
  },
  (t) => [
    index('audit_rounds_shop_period_idx').on(t.shopId, t.periodEnd),
    index('audit_rounds_auditor_id_idx').on(t.auditorId),
    check('audit_rounds_period_order', sql`${t.periodEnd} >= ${t.periodStart}`),
  ],
);
export type AuditRound = typeof auditRounds.$inferSelect;
export type NewAuditRound = typeof auditRounds.$inferInsert;

export const auditSamples = pgTable(
  'audit_samples',
  {
    id: id(),
    roundId: integer('round_id')
      .notNull()
      .references(() => auditRounds.id, { onDelete: 'cascade' }),
    jobId: integer('job_id')
      .notNull()
      .references(() => jobs.id),
    /** Order of the draw. */
    position: integer('position').notNull(),
    /** 0–100 from the weights of passed applicable items. */
    score: numeric('score', { precision: 5, scale: 2, mode: 'number' }),
    verdict: auditVerdict('verdict'),
    note: text('note'),
    startedAt: instant('started_at'),
    completedAt: instant('completed_at'),
  },
  (t) => [
    uniqueIndex('audit_samples_round_job_uq').on(t.roundId, t.jobId),
    index('audit_samples_job_id_idx').on(t.jobId),
  ],
);
export type AuditSample = typeof auditSamples.$inferSelect;
export type NewAuditSample = typeof auditSamples.$inferInsert;

export const auditAnswers = pgTable(
  'audit_answers',
  {
    id: id(),
    sampleId: integer('sample_id')
      .notNull()
      .references(() => auditSamples.id, { onDelete: 'cascade' }),
    itemId: integer('item_id')
      .notNull()
      .references(() => auditFormItems.id),
    result: auditAnswerResult('result').notNull(),
    note: text('note'),
    answeredAt: instant('answered_at').notNull().defaultNow(),
  },
  (t) => [uniqueIndex('audit_answers_sample_item_uq').on(t.sampleId, t.itemId)],
);
export type AuditAnswer = typeof auditAnswers.$inferSelect;
export type NewAuditAnswer = typeof auditAnswers.$inferInsert;
