import { integer, timestamp } from 'drizzle-orm/pg-core';

/** Identity primary key; "by default" so the seed and imports may supply explicit ids. */
export const id = () => integer('id').primaryKey().generatedByDefaultAsIdentity();

/** An instant, stored in UTC. */
export const instant = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

export const createdAt = () => instant('created_at').notNull().defaultNow();
export const updatedAt = () =>
  instant('updated_at')
    .notNull()
    .defaultNow()
    .$onUpdate(() => new Date());
