import { date, index, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { auditRounds } from './audits';
import { createdAt, id, instant, updatedAt } from './columns';
import { comebacks } from './comebacks';
import { correctiveActionSource, correctiveActionStatus } from './enums';
import { shops } from './shops';
import { users } from './users';

export const correctiveActions = pgTable(
  'corrective_actions',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    source: correctiveActionSource('source').notNull(),
    auditRoundId: integer('audit_round_id').references(() => auditRounds.id),
    comebackId: integer('comeback_id').references(() => comebacks.id),
    title: text('title').notNull(),
    description: text('description'),
    /** Who must carry it out (usually the shop lead). */
    ownerId: integer('owner_id').references(() => users.id),
    /** Local date in the shop's zone. */
    dueOn: date('due_on', { mode: 'string' }).notNull(),
    status: correctiveActionStatus('status').notNull().default('open'),
    resolutionNote: text('resolution_note'),
    createdById: integer('created_by_id').references(() => users.id),
    doneAt: instant('done_at'),
    verifiedAt: instant('verified_at'),
    verifiedById: integer('verified_by_id').references(() => users.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index('corrective_actions_shop_status_idx').on(t.shopId, t.status),
    index('corrective_actions_due_on_idx').on(t.dueOn),
    index('corrective_actions_audit_round_id_idx').on(t.auditRoundId),
    index('corrective_actions_comeback_id_idx').on(t.comebackId),
  ],
);
export type CorrectiveAction = typeof correctiveActions.$inferSelect;
export type NewCorrectiveAction = typeof correctiveActions.$inferInsert;
