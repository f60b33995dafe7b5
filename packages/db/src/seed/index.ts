import { hash } from '@node-rs/argon2';
import { sql } from 'drizzle-orm';
import type { PgTable } from 'drizzle-orm/pg-core';
import type { Db } from '../client';
import * as s from '../schema';
import { keyColumns, SEEDED_TABLES } from './digest';
import { assertForeignKeys, bulkInsert, resetIdentity } from './insert';
import { DEMO_PASSWORD } from './network';
import { generate, type SeedData } from './simulate';

export { seedDigest, SEEDED_TABLES } from './digest';
export { DEMO_ACCOUNTS, DEMO_PASSWORD, NETWORK_NAME } from './network';

/** The demo's fixed "today", so the same seed always gives the same rows. */
export const DEFAULT_SEED_NOW = new Date('2026-12-01T12:00:00Z');
export const DEFAULT_SEED = 'saltwick-and-spool';

export interface SeedOptions {
  seed?: string;
  /** Years of history ending at `now`. */
  years?: number;
  now?: Date;
  /** Pre-computed hash of the demo password (tests reuse one to save time). */
  passwordHash?: string;
}

export interface SeedResult {
  counts: Record<string, number>;
  milliseconds: number;
}

/** True when the database has no shops and no users (nothing to keep). */
export async function isEmpty(db: Pick<Db, 'execute'>): Promise<boolean> {
  const { rows } = await db.execute<{ empty: boolean }>(
    sql`select not exists (select 1 from ${s.shops}) and not exists (select 1 from ${s.users}) as empty`,
  );
  return rows[0]?.empty === true;
}

const INSERT_ORDER: [keyof SeedData, PgTable][] = [
  ['regions', s.regions],
  ['shops', s.shops],
  ['servicePrices', s.servicePrices],
  ['users', s.users],
  ['accountLinks', s.accountLinks],
  ['rootCauses', s.rootCauses],
  ['serviceStandards', s.serviceStandards],
  ['serviceStandardSteps', s.serviceStandardSteps],
  ['auditForms', s.auditForms],
  ['auditFormItems', s.auditFormItems],
  ['networkSettings', s.networkSettings],
  ['customers', s.customers],
  ['reels', s.reels],
  ['jobs', s.jobs],
  ['jobEvents', s.jobEvents],
  ['benchSessions', s.benchSessions],
  ['partLines', s.partLines],
  ['checklistTicks', s.checklistTicks],
  ['comebacks', s.comebacks],
];

/**
 * Seeds the invented demo network (README, "Demo accounts") into an empty database, in one
 * transaction.
 * Deterministic: the same seed, years and `now` give the same rows (see `seedDigest`); the
 * only chance comes from the seeded generator and the only clock is `now`.
 */
export async function seedDemo(db: Db, options: SeedOptions = {}): Promise<SeedResult> {
  const started = performance.now();
  if (!(await isEmpty(db))) {
    throw new Error(
      'The database already has shops or users; the demo seed only fills an empty one.',
    );
  }
  // One hash for every demo account: argon2 is slow on purpose.
  const passwordHash = options.passwordHash ?? (await hash(DEMO_PASSWORD));
  const data = generate({
    seed: options.seed ?? DEFAULT_SEED,
    years: options.years ?? 2,
    now: options.now ?? DEFAULT_SEED_NOW,
    passwordHash,
  });
  const counts: Record<string, number> = {};
  await db.transaction(async (tx) => {
    // Foreign-key triggers dominate a bulk load; where the role may switch them off (as
    // pg_restore --disable-triggers does), every reference is checked once at the end instead.
    let checksOff = false;
    try {
      await tx.transaction(async (sp) => {
        await sp.execute(sql`set local session_replication_role = replica`);
      });
      checksOff = true;
    } catch {
      checksOff = false;
    }
    for (const [key, table] of INSERT_ORDER) {
      counts[key] = await bulkInsert(tx, table, data[key]);
    }
    if (checksOff) {
      await tx.execute(sql`set local session_replication_role = origin`);
      await assertForeignKeys(tx, SEEDED_TABLES);
    }
    for (const table of SEEDED_TABLES) {
      if (keyColumns(table)[0] === 'id') await resetIdentity(tx, table);
    }
    // The derived figures' triggers were off with the other triggers (or fired once per batch):
    // one rebuild from the loaded jobs either way.
    await tx.execute(sql`select rebuild_shop_month_figures()`);
  });
  // A bulk load leaves the planner without statistics and the visibility map unset, so the
  // network view's index-only scans would visit the heap. PGlite has no autovacuum and a
  // server's would come later; VACUUM cannot run inside the transaction.
  await db.execute(
    sql`vacuum (analyze) ${sql.join([...SEEDED_TABLES, s.shopMonthFigures], sql`, `)}`,
  );
  return { counts, milliseconds: Math.round(performance.now() - started) };
}
