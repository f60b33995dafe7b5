import { index, integer, jsonb, pgTable, text } from 'drizzle-orm/pg-core';
import { id, instant } from './columns';
import { shops } from './shops';
import { users } from './users';

/** Who changed what: one row per change, with the entity before and after. */
export const activityLog = pgTable(
  'activity_log',
  {
    id: id(),
    at: instant('at').notNull().defaultNow(),
    /** Null for changes made by the system (e.g. a webhook). */
    userId: integer('user_id').references(() => users.id),
    /** Dotted verb, e.g. "job.transition", "comeback.review", "settings.update". */
    action: text('action').notNull(),
    entityType: text('entity_type').notNull(),
    entityId: integer('entity_id'),
    /** Scope for filtering by the caller's shops. */
    shopId: integer('shop_id').references(() => shops.id),
    before: jsonb('before').$type<Record<string, unknown>>(),
    after: jsonb('after').$type<Record<string, unknown>>(),
  },
  (t) => [
    index('activity_log_entity_idx').on(t.entityType, t.entityId),
    index('activity_log_shop_at_idx').on(t.shopId, t.at),
    index('activity_log_user_at_idx').on(t.userId, t.at),
  ],
);
export type ActivityLogEntry = typeof activityLog.$inferSelect;
export type NewActivityLogEntry = typeof activityLog.$inferInsert;
