import { sql } from 'drizzle-orm';
import { boolean, check, index, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { createdAt, id, instant } from './columns';
import { accountLinkPurpose, userRole } from './enums';
import { regions, shops } from './shops';

export const users = pgTable(
  'users',
  {
    id: id(),
    /** Stored lower-case so sign-in is case-insensitive and unique. */
    email: text('email').notNull().unique(),
    name: text('name').notNull(),
    /** argon2id PHC string; null for an invited person who has not set a password yet. */
    passwordHash: text('password_hash'),
    role: userRole('role').notNull(),
    /** Scope of shop leads and technicians. */
    shopId: integer('shop_id').references(() => shops.id),
    /** Scope of regional managers. */
    regionId: integer('region_id').references(() => regions.id),
    /** Seeded demo account: the demo password is accepted only for these. */
    isDemo: boolean('is_demo').notNull().default(false),
    active: boolean('active').notNull().default(true),
    /**
     * Carried in the session cookie at sign-in; a session whose version differs has ended. Sign-out
     * bumps it, and so does the trigger of migration 0004 whenever the password, active flag, role,
     * shop or region changes, whatever code path wrote the row.
     */
    sessionVersion: integer('session_version').notNull().default(0),
    lastSignInAt: instant('last_sign_in_at'),
    createdAt: createdAt(),
  },
  (t) => [
    index('users_shop_id_idx').on(t.shopId),
    index('users_region_id_idx').on(t.regionId),
    check('users_email_lower_case', sql`${t.email} = lower(${t.email})`),
    check(
      'users_scope_matches_role',
      sql`(${t.role} in ('shop_lead', 'technician') and ${t.shopId} is not null and ${t.regionId} is null)
        or (${t.role} = 'regional_manager' and ${t.regionId} is not null and ${t.shopId} is null)
        or (${t.role} in ('owner', 'auditor') and ${t.shopId} is null and ${t.regionId} is null)`,
    ),
  ],
);
export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;

/**
 * One-time links e-mailed to a person: an invitation to set a first password, or a password
 * reset. Only the SHA-256 of the token is stored; a link works once, until it expires or is
 * withdrawn.
 */
export const accountLinks = pgTable(
  'account_links',
  {
    id: id(),
    userId: integer('user_id')
      .notNull()
      .references(() => users.id),
    purpose: accountLinkPurpose('purpose').notNull(),
    /** Hex SHA-256 of the token in the link. */
    tokenHash: text('token_hash').notNull().unique(),
    /** Who sent it (the owner for an invitation); null when the person asked for it. */
    createdById: integer('created_by_id').references(() => users.id),
    createdAt: createdAt(),
    expiresAt: instant('expires_at').notNull(),
    usedAt: instant('used_at'),
    withdrawnAt: instant('withdrawn_at'),
  },
  (t) => [index('account_links_user_idx').on(t.userId, t.purpose)],
);
export type AccountLink = typeof accountLinks.$inferSelect;
export type NewAccountLink = typeof accountLinks.$inferInsert;
