import { bigint, integer, pgTable, varchar } from 'drizzle-orm/pg-core';

/**
 * Sign-in failure counters of rate-limiter-flexible's PostgreSQL store, shared by every instance of
 * the app. The library reads and writes these columns by position and name (key, points, expire),
 * so their order and types must stay as they are; keys are "<prefix>:<e-mail or address>".
 */
export const signInThrottle = pgTable('sign_in_throttle', {
  key: varchar('key', { length: 255 }).primaryKey(),
  points: integer('points').notNull().default(0),
  /** Epoch milliseconds at which the counter resets; null never expires. */
  expire: bigint('expire', { mode: 'number' }),
});
