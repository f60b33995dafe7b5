import { sql } from 'drizzle-orm';
import { cpSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import {
  appliedMigrationCount,
  closeAllDbs,
  DataDirInUseError,
  getDb,
  MEMORY,
  journaledMigrationCount,
  migrate,
  openDb,
  resolveMigrationsDir,
  runMigrations,
} from './client';
import { regions, shops } from './schema';
import { freshDb, TARGET } from './test/databases';

describe(`migrations (${TARGET})`, () => {
  it('apply every journaled migration to an empty database, then nothing on a second run, giving a working schema', async () => {
    const handle = await freshDb();
    try {
      expect(await appliedMigrationCount(handle.db)).toBe(0);
      const journaled = journaledMigrationCount();
      expect(journaled).toBeGreaterThan(0);
      expect(await migrate(handle.db, handle.driver)).toBe(journaled);
      expect(await runMigrations(handle)).toBe(0);
      expect(await appliedMigrationCount(handle.db)).toBe(journaled);

      const { rows } = await handle.db.execute<{ table_name: string }>(
        sql`select table_name from information_schema.tables where table_schema = 'public' order by 1`,
      );
      const tables = rows.map((r) => r.table_name);
      for (const t of [
        'jobs',
        'job_events',
        'comebacks',
        'audit_rounds',
        'month_closes',
        'royalty_invoices',
        'unsubscribe_tokens',
      ]) {
        expect(tables).toContain(t);
      }

      // The typed query builder writes, reads back with relations, and the checks hold.
      const [region] = await handle.db
        .insert(regions)
        .values({ name: 'Test Shore', code: 'test' })
        .returning();
      await handle.db.insert(shops).values({
        regionId: region!.id,
        name: 'Test Shop',
        slug: 'test-shop',
        timeZone: 'America/New_York',
        openingHours: { mon: [{ open: '09:00', close: '17:00' }] },
        labourRateCents: 7500,
        royaltyRateBp: 600,
      });
      const found = await handle.db.query.shops.findFirst({ with: { region: true } });
      expect(found?.region.code).toBe('test');
      expect(found?.closedDates).toEqual([]);
      expect(found?.createdAt).toBeInstanceOf(Date);
      const { id: _id, region: _region, ...copy } = found!;
      await expect(
        handle.db.insert(shops).values({ ...copy, slug: 'other', royaltyRateBp: 20_000 }),
      ).rejects.toMatchObject({
        cause: { message: expect.stringContaining('shops_royalty_rate_bp_range') },
      });
    } finally {
      await handle.close();
    }
  });
});

describe(`migrations from several instances at once (${TARGET})`, () => {
  // The embedded database belongs to one process (its folder lock); a server is shared.
  it.runIf(TARGET === 'pg')(
    'apply each migration once, however many start together',
    async () => {
      const first = await freshDb();
      const others = await Promise.all([1, 2, 3].map(() => openDb({ url: first.url! })));
      try {
        const applied = await Promise.all(
          [first, ...others].map((handle) => migrate(handle.db, handle.driver)),
        );
        expect(applied.sort()).toEqual([0, 0, 0, journaledMigrationCount()]);
        const { rows } = await first.db.execute<{ n: number }>(
          sql`select count(*)::int as n from drizzle.__drizzle_migrations`,
        );
        expect(rows[0]!.n).toBe(journaledMigrationCount());
      } finally {
        await Promise.all(others.map((handle) => handle.close()));
        await first.close();
      }
    },
    60_000,
  );
});

describe('migrations folder', () => {
  it('is found from the module path, or taken from an explicit folder', () => {
    const dir = resolveMigrationsDir();
    expect(dir.endsWith(path.join('packages', 'db', 'drizzle'))).toBe(true);
    expect(resolveMigrationsDir(dir)).toBe(dir);
  });

  it('prefers REELWRIGHT_MIGRATIONS_DIR over the module path (bundled servers)', () => {
    const previous = process.env.REELWRIGHT_MIGRATIONS_DIR;
    const copy = path.join(mkdtempSync(path.join(os.tmpdir(), 'rw-migrations-')), 'drizzle');
    cpSync(resolveMigrationsDir(), copy, { recursive: true });
    try {
      process.env.REELWRIGHT_MIGRATIONS_DIR = copy;
      expect(resolveMigrationsDir()).toBe(copy);
      // A folder without a journal is passed over.
      process.env.REELWRIGHT_MIGRATIONS_DIR = path.dirname(copy);
      expect(resolveMigrationsDir()).not.toBe(path.dirname(copy));
    } finally {
      if (previous === undefined) delete process.env.REELWRIGHT_MIGRATIONS_DIR;
      else process.env.REELWRIGHT_MIGRATIONS_DIR = previous;
      rmSync(path.dirname(copy), { recursive: true, force: true });
    }
  });
});

describe('getDb', () => {
  afterEach(() => closeAllDbs());

  it('opens one handle per database for the whole process, until it is closed', async () => {
    const [a, b] = await Promise.all([
      getDb({ dataDir: MEMORY, migrate: true }),
      getDb({ dataDir: MEMORY, migrate: true }),
    ]);
    expect(a).toBe(b);
    expect(a.driver).toBe('pglite');
    expect(a.migrationsApplied).toBe(journaledMigrationCount());
    expect(await getDb({ dataDir: MEMORY })).toBe(a);
    await a.close();
    const c = await getDb({ dataDir: MEMORY });
    expect(c).not.toBe(a);
    expect(c.migrationsApplied).toBe(0);
  });
});

describe('PGlite in a worker thread (the web server’s embedded database)', () => {
  it('keeps this thread free during a long statement, takes turns with transactions, and keeps its data and lock', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'rw-isolated-'));
    try {
      const handle = await openDb({ dataDir: dir, isolate: true });
      try {
        expect(handle.driver).toBe('pglite');
        await runMigrations(handle);
        // A second opener of the folder is refused while this one holds it.
        await expect(openDb({ dataDir: dir, isolate: true })).rejects.toBeInstanceOf(
          DataDirInUseError,
        );

        // While the database works for 600 ms, timers on this thread keep firing.
        let ticks = 0;
        const timer = setInterval(() => ticks++, 20);
        await handle.db.execute(sql`select pg_sleep(0.6)`);
        clearInterval(timer);
        expect(ticks).toBeGreaterThanOrEqual(15);

        // A query sent while a transaction is open waits for it and never runs inside it.
        let inside = -1;
        const tx = handle.db.transaction(async (t) => {
          await t.execute(sql`create table turn_test (n int)`);
          await t.execute(sql`insert into turn_test values (1)`);
          await new Promise((r) => setTimeout(r, 100));
          await t.execute(sql`insert into turn_test values (2)`);
          throw new Error('roll back');
        });
        const outside = handle.db
          .execute<{ n: number }>(
            sql`select count(*)::int as n from pg_tables where tablename = 'turn_test'`,
          )
          .then((r) => (inside = r.rows[0]!.n));
        await expect(tx).rejects.toThrow('roll back');
        await outside;
        expect(inside).toBe(0);

        await handle.db.insert(regions).values({ name: 'Kept Shore', code: 'kept' });
      } finally {
        await handle.close();
      }
      // Closed cleanly: the next opener gets the folder and finds the row.
      const again = await openDb({ dataDir: dir });
      try {
        const rows = await again.db.select().from(regions);
        expect(rows.map((r) => r.code)).toEqual(['kept']);
      } finally {
        await again.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});
