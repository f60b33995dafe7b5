import { sql } from 'drizzle-orm';
import { boolean, check, date, index, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { createdAt, id } from './columns';
import { reelKind, useProfile, waterType } from './enums';
import { importBatches } from './imports';
import { shops } from './shops';

export const customers = pgTable(
  'customers',
  {
    id: id(),
    /** Home shop: where the customer first checked a reel in. */
    shopId: integer('shop_id')
      .notNull()
      .references(() => shops.id),
    name: text('name').notNull(),
    phone: text('phone'),
    email: text('email'),
    /** Agreed to pre-season service reminders by e-mail. */
    reminderConsent: boolean('reminder_consent').notNull().default(false),
    /** The CSV import that created this customer, so a failed import can take it back. */
    importBatchId: integer('import_batch_id').references(() => importBatches.id),
    createdAt: createdAt(),
  },
  (t) => [
    index('customers_shop_id_name_idx').on(t.shopId, t.name),
    index('customers_import_batch_id_idx')
      .on(t.importBatchId)
      .where(sql`${t.importBatchId} is not null`),
    index('customers_email_idx').on(t.email),
    index('customers_phone_idx').on(t.phone),
  ],
);
export type Customer = typeof customers.$inferSelect;
export type NewCustomer = typeof customers.$inferInsert;

export const reels = pgTable(
  'reels',
  {
    id: id(),
    customerId: integer('customer_id')
      .notNull()
      .references(() => customers.id),
    kind: reelKind('kind').notNull(),
    maker: text('maker').notNull(),
    model: text('model').notNull(),
    /** Maker's size designation as printed on the reel, e.g. "3000", "30W", "5/6". */
    size: text('size'),
    bearingCount: integer('bearing_count'),
    /** As printed, "6.2:1"; text because makers print it that way and it is never summed. */
    gearRatio: text('gear_ratio'),
    useProfile: useProfile('use_profile').notNull().default('light'),
    water: waterType('water').notNull().default('fresh'),
    serialNumber: text('serial_number'),
    /** Local date of the last completed service; drives service-due reminders. */
    lastServicedOn: date('last_serviced_on', { mode: 'string' }),
    /** The CSV import that created this reel, so a failed import can take it back. */
    importBatchId: integer('import_batch_id').references(() => importBatches.id),
    createdAt: createdAt(),
  },
  (t) => [
    index('reels_customer_id_idx').on(t.customerId),
    index('reels_import_batch_id_idx')
      .on(t.importBatchId)
      .where(sql`${t.importBatchId} is not null`),
    index('reels_last_serviced_on_idx').on(t.lastServicedOn),
    check('reels_bearing_count_nonnegative', sql`${t.bearingCount} >= 0`),
  ],
);
export type Reel = typeof reels.$inferSelect;
export type NewReel = typeof reels.$inferInsert;
