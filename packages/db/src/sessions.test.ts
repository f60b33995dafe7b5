import { sql } from 'drizzle-orm';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runMigrations, type Db, type DbHandle } from './client';
import { pgStyleClient, positional } from './sql-client';
import { freshDb, TARGET } from './test/databases';

// Migration 0004: users.session_version bumped by a trigger, and the sign-in throttle's table,
// which rate-limiter-flexible's PostgreSQL store reads and writes through pgStyleClient.

describe(`session version and sign-in throttle store (${TARGET})`, () => {
  let handle: DbHandle;
  let db: Db;

  const version = async (id: number) => {
    const { rows } = await db.execute<{ v: number }>(
      sql`select session_version as v from users where id = ${id}`,
    );
    return Number(rows[0]?.v);
  };

  beforeAll(async () => {
    handle = await freshDb();
    db = handle.db;
    await runMigrations(handle);
    await db.execute(
      sql`insert into regions (id, name, code) values (1, 'Coast', 'C'), (2, 'Bay', 'B')`,
    );
    await db.execute(sql`
      insert into shops (id, region_id, name, slug, time_zone, opening_hours, labour_rate_cents,
        royalty_rate_bp)
      values (1, 1, 'Harbour', 'harbour', 'America/New_York', '{}', 6000, 600),
        (2, 1, 'Quay', 'quay', 'America/New_York', '{}', 5000, 600)`);
    await db.execute(sql`
      insert into users (id, email, name, password_hash, role, shop_id, region_id)
      values (1, 'lead@example.test', 'Lead', 'hash-1', 'shop_lead', 1, null),
        (2, 'manager@example.test', 'Manager', 'hash-2', 'regional_manager', null, 1)`);
  });
  afterAll(() => handle?.close());

  it('a new user starts at session version 0', async () => {
    expect(await version(1)).toBe(0);
  });

  it('changing the password, the active flag, the role, the shop or the region ends sessions', async () => {
    const changes = [
      sql`update users set password_hash = 'hash-1b' where id = 1`,
      sql`update users set active = false where id = 1`,
      sql`update users set active = true where id = 1`,
      sql`update users set shop_id = 2 where id = 1`,
      sql`update users set role = 'technician' where id = 1`,
    ];
    for (const [i, change] of changes.entries()) {
      await db.execute(change);
      expect(await version(1)).toBe(i + 1);
    }
    await db.execute(sql`update users set region_id = 2 where id = 2`);
    expect(await version(2)).toBe(1);
  });

  it('a change of name, e-mail or last sign-in keeps sessions', async () => {
    const before = await version(1);
    await db.execute(
      sql`update users set name = 'Lead Two', email = 'lead2@example.test', last_sign_in_at = now() where id = 1`,
    );
    await db.execute(sql`update users set password_hash = password_hash where id = 1`);
    expect(await version(1)).toBe(before);
  });

  it('an explicit bump (sign-out) together with a role change counts once', async () => {
    const before = await version(2);
    await db.execute(
      sql`update users set session_version = session_version + 1, role = 'owner', region_id = null where id = 2`,
    );
    expect(await version(2)).toBe(before + 1);
  });

  it('the PostgreSQL store counts, blocks and forgets failures in the migrated table', async () => {
    const limiter = new RateLimiterPostgres({
      storeClient: pgStyleClient(db),
      storeType: 'client',
      tableName: 'sign_in_throttle',
      tableCreated: true,
      clearExpiredByTimeout: false,
      keyPrefix: 'test_account',
      points: 3,
      duration: 60,
    });
    for (let i = 1; i <= 3; i++) {
      const res = await limiter.consume('someone@example.test');
      expect(res.consumedPoints).toBe(i);
    }
    const refused = await limiter.consume('someone@example.test').catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(RateLimiterRes);
    expect((refused as RateLimiterRes).remainingPoints).toBe(0);
    expect((refused as RateLimiterRes).msBeforeNext).toBeGreaterThan(0);
    expect((await limiter.get('someone@example.test'))?.consumedPoints).toBe(4);

    await limiter.block('someone@example.test', 600);
    expect((await limiter.get('someone@example.test'))?.msBeforeNext).toBeGreaterThan(590_000);

    expect(await limiter.delete('someone@example.test')).toBe(true);
    expect(await limiter.get('someone@example.test')).toBeNull();
    expect(await limiter.delete('someone@example.test')).toBe(false);
    const { rows } = await db.execute<{ key: string }>(sql`select key from sign_in_throttle`);
    expect(rows).toEqual([]);
  });

  it('positional SQL repeats a placeholder and refuses a missing value', async () => {
    const { rows } = await db.execute<{ a: number; b: string }>(
      positional('select $1::int + $1::int as a, $2::text as b', [2, 'x']),
    );
    expect(rows).toEqual([{ a: 4, b: 'x' }]);
    expect(() => positional('select $2', [1])).toThrow(RangeError);
  });
});
