import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  index,
  integer,
  jsonb,
  pgTable,
  text,
  uniqueIndex,
} from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { serviceType } from './enums';

/** Same shape as `Weekday` / `OpeningSpan` in @reelwright/metrics, so a shop row is a calendar. */
export type Weekday = 'mon' | 'tue' | 'wed' | 'thu' | 'fri' | 'sat' | 'sun';
export interface OpeningSpan {
  /** Local "HH:mm". */
  open: string;
  /** Local "HH:mm". */
  close: string;
}
export type OpeningHours = Partial<Record<Weekday, OpeningSpan[]>>;

export const regions = pgTable('regions', {
  id: id(),
  name: text('name').notNull(),
  code: text('code').notNull().unique(),
  createdAt: createdAt(),
});
export type Region = typeof regions.$inferSelect;
export type NewRegion = typeof regions.$inferInsert;

export const shops = pgTable(
  'shops',
  {
    id: id(),
    regionId: integer('region_id')
      .notNull()
      .references(() => regions.id),
    name: text('name').notNull(),
    slug: text('slug').notNull().unique(),
    /** IANA zone, e.g. "America/New_York". */
    timeZone: text('time_zone').notNull(),
    openingHours: jsonb('opening_hours').$type<OpeningHours>().notNull(),
    /** Local dates "YYYY-MM-DD" the shop is closed (holidays). */
    closedDates: jsonb('closed_dates').$type<string[]>().notNull().default([]),
    /** Posted labour rate, cents per hour. */
    labourRateCents: integer('labour_rate_cents').notNull(),
    /** Royalty owed to the franchisor, basis points of billed revenue. */
    royaltyRateBp: integer('royalty_rate_bp').notNull(),
    /** "MM-DD": the local fishing season, for service reminders. */
    seasonStart: text('season_start').notNull().default('03-15'),
    seasonEnd: text('season_end').notNull().default('11-15'),
    email: text('email'),
    phone: text('phone'),
    /** Payment provider customer that royalty invoices are billed to. */
    stripeCustomerId: text('stripe_customer_id').unique(),
    /** ISO 4217 code of the shop's prices and royalties. */
    currency: text('currency').notNull().default('USD'),
    /** False once the owner closes the shop: it takes no new jobs; its history stays. */
    active: boolean('active').notNull().default(true),
    /**
     * When the owner opened and closed the shop (null: open before the records begin, or still
     * open); they bound the periods the network view and the month close list it in.
     */
    openedAt: instant('opened_at'),
    closedAt: instant('closed_at'),
    createdAt: createdAt(),
  },
  (t) => [
    index('shops_region_id_idx').on(t.regionId),
    check('shops_currency_code', sql`${t.currency} ~ '^[A-Z]{3}$'`),
    check('shops_royalty_rate_bp_range', sql`${t.royaltyRateBp} between 0 and 10000`),
    check('shops_labour_rate_cents_nonnegative', sql`${t.labourRateCents} >= 0`),
  ],
);
export type Shop = typeof shops.$inferSelect;
export type NewShop = typeof shops.$inferInsert;

/** A shop's flat price per service type (labour charged when not billed by bench time). */
export const servicePrices = pgTable(
  'service_prices',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    serviceType: serviceType('service_type').notNull(),
    /** Null: billed by bench time at the posted rate. */
    flatPriceCents: integer('flat_price_cents'),
  },
  (t) => [uniqueIndex('service_prices_shop_service_uq').on(t.shopId, t.serviceType)],
);
export type ServicePrice = typeof servicePrices.$inferSelect;
export type NewServicePrice = typeof servicePrices.$inferInsert;

/**
 * A shop's royalty rate from a month on: the month close of month M uses the row with the latest
 * `fromMonth` ≤ M (else the shop's `royaltyRateBp`), so a change from next month leaves this
 * month and every earlier one as they were. The first change also records the rate it replaces,
 * from 2000-01.
 */
export const shopRoyaltyRates = pgTable(
  'shop_royalty_rates',
  {
    id: id(),
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    /** "YYYY-MM". */
    fromMonth: text('from_month').notNull(),
    royaltyRateBp: integer('royalty_rate_bp').notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('shop_royalty_rates_shop_month_uq').on(t.shopId, t.fromMonth),
    check('shop_royalty_rates_month', sql`${t.fromMonth} ~ '^[0-9]{4}-(0[1-9]|1[0-2])$'`),
    check('shop_royalty_rates_bp_range', sql`${t.royaltyRateBp} between 0 and 10000`),
  ],
);
export type ShopRoyaltyRate = typeof shopRoyaltyRates.$inferSelect;
