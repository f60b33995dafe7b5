import { bigint, date, integer, pgTable, primaryKey, text } from 'drizzle-orm/pg-core';
import { shops } from './shops';

/**
 * Each shop's jobs summed per calendar month of its own zone, so that the network comparison reads
 * one row per shop and month instead of every job of the period. Kept equal to the jobs table by
 * the triggers of migration 0003 (never written by the application): a job counts in the month it
 * became ready (the ready figures) and in the month it was collected (`collected`). The month's
 * turnarounds are kept whole, so that medians and 90th percentiles stay exact: ascending, each
 * written as 7 decimal digits with no separator, so that a reader picks the i-th without parsing
 * the rest, and as text, the form both engines return fastest (README, "Benchmark of the network
 * comparison").
 */
export const shopMonthFigures = pgTable(
  'shop_month_figures',
  {
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id, { onDelete: 'cascade' }),
    /** The first day of the shop-local month. */
    month: date('month').notNull(),
    jobsReady: integer('jobs_ready').notNull(),
    customerN: integer('customer_n').notNull(),
    customerTotal: bigint('customer_total', { mode: 'number' }).notNull(),
    /** Customer turnaround minutes of the month's ready jobs: ascending, 7 digits each. */
    customerMinutes: text('customer_minutes').notNull(),
    benchN: integer('bench_n').notNull(),
    benchTotal: bigint('bench_total', { mode: 'number' }).notNull(),
    /** Bench turnaround minutes of the month's ready jobs: ascending, 7 digits each. */
    benchTurnarounds: text('bench_turnarounds').notNull(),
    waitingMinutes: bigint('waiting_minutes', { mode: 'number' }).notNull(),
    promised: integer('promised').notNull(),
    onTime: integer('on_time').notNull(),
    revenueCents: bigint('revenue_cents', { mode: 'number' }).notNull(),
    labourCents: bigint('labour_cents', { mode: 'number' }).notNull(),
    benchMinutes: bigint('bench_minutes', { mode: 'number' }).notNull(),
    /** Jobs collected in the month. */
    collected: integer('collected').notNull(),
  },
  (t) => [primaryKey({ columns: [t.shopId, t.month] })],
);
export type ShopMonthFigures = typeof shopMonthFigures.$inferSelect;
