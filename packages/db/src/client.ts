import { sql, type Assume } from 'drizzle-orm';
import { readMigrationFiles } from 'drizzle-orm/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import path from 'node:path';
import { lockDataDir, type FolderLock } from './lock';
import { defaultDataDir, resolveMigrationsDir } from './paths';
import * as schema from './schema';

export { DataDirInUseError } from './lock';
export { defaultDataDir, findWorkspaceRoot, resolveMigrationsDir } from './paths';

export type Schema = typeof schema;

/** Result of `db.execute`: both drivers return `{ rows }`. */
export interface DbQueryResult<TRow> {
  rows: TRow[];
}
export interface DbQueryResultHKT extends PgQueryResultHKT {
  type: DbQueryResult<Assume<this['row'], Record<string, unknown>>>;
}

/** The database, whichever driver is underneath. */
export type Db = PgDatabase<DbQueryResultHKT, Schema>;
/** A transaction handle, as passed to `db.transaction(async (tx) => …)`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

export type Driver = 'pglite' | 'pg';

export interface OpenDbOptions {
  /** A postgres:// URL: use a PostgreSQL server through node-postgres. */
  url?: string;
  /** PGlite data folder, or 'memory://'. Default: `<workspace root>/data/pglite`. */
  dataDir?: string;
  /** Pool size for PostgreSQL. */
  maxConnections?: number;
}

export interface DbHandle {
  db: Db;
  driver: Driver;
  /** The PGlite folder (absolute) or 'memory://'; undefined for PostgreSQL. */
  dataDir?: string;
  close(): Promise<void>;
}

export const MEMORY = 'memory://';

export async function openDb(options: OpenDbOptions = {}): Promise<DbHandle> {
  if (options.url) return openPg(options.url, options.maxConnections ?? 10);
  return openPglite(options.dataDir ?? defaultDataDir());
}

async function openPg(url: string, max: number): Promise<DbHandle> {
  const [{ default: pg }, { drizzle }] = await Promise.all([
    import('pg'),
    import('drizzle-orm/node-postgres'),
  ]);
  const pool = new pg.Pool({ connectionString: url, max });
  // An idle client losing its connection must not crash the process; the next query reconnects.
  pool.on('error', (error) => console.error('[db] idle PostgreSQL client error:', error.message));
  const db = drizzle({ client: pool, schema }) as unknown as Db;
  let closed = false;
  return {
    db,
    driver: 'pg',
    async close() {
      if (closed) return;
      closed = true;
      await pool.end();
    },
  };
}

async function openPglite(dataDir: string): Promise<DbHandle> {
  const memory = dataDir === MEMORY;
  const folder = memory ? MEMORY : path.resolve(dataDir);
  const lock: FolderLock | null = memory ? null : await lockDataDir(folder);
  try {
    const [{ PGlite }, { drizzle }] = await Promise.all([
      import('@electric-sql/pglite'),
      import('drizzle-orm/pglite'),
    ]);
    const client = memory ? await PGlite.create() : await PGlite.create(folder);
    const db = drizzle({ client, schema }) as unknown as Db;
    let closed = false;
    return {
      db,
      driver: 'pglite',
      dataDir: folder,
      async close() {
        if (closed) return;
        closed = true;
        try {
          await client.close();
        } finally {
          lock?.release();
        }
      },
    };
  } catch (error) {
    lock?.release();
    throw error;
  }
}

export interface MigrateOptions {
  /** Folder holding the SQL files and meta/_journal.json; see `resolveMigrationsDir`. */
  migrationsFolder?: string;
}

const MIGRATIONS_SCHEMA = 'drizzle';
const MIGRATIONS_TABLE = '__drizzle_migrations';

/** Number of journaled migrations recorded as applied (0 on an empty database). */
export async function appliedMigrationCount(db: Db): Promise<number> {
  const table = `${MIGRATIONS_SCHEMA}.${MIGRATIONS_TABLE}`;
  const exists = await db.execute<{ present: boolean }>(
    sql`select to_regclass(${table}) is not null as present`,
  );
  if (!exists.rows[0]?.present) return 0;
  const { rows } = await db.execute<{ n: number | string }>(
    sql`select count(*) as n from ${sql.identifier(MIGRATIONS_SCHEMA)}.${sql.identifier(MIGRATIONS_TABLE)}`,
  );
  return Number(rows[0]?.n ?? 0);
}

/** Applies the journaled migrations not yet applied, in one transaction; returns how many ran. */
export async function migrate(
  db: Db,
  driver: Driver,
  options: MigrateOptions = {},
): Promise<number> {
  const migrationsFolder = resolveMigrationsDir(options.migrationsFolder);
  const before = await appliedMigrationCount(db);
  const config = {
    migrationsFolder,
    migrationsSchema: MIGRATIONS_SCHEMA,
    migrationsTable: MIGRATIONS_TABLE,
  };
  if (driver === 'pglite') {
    const { migrate: run } = await import('drizzle-orm/pglite/migrator');
    await run(db as unknown as Parameters<typeof run>[0], config);
  } else {
    const { migrate: run } = await import('drizzle-orm/node-postgres/migrator');
    await run(db as unknown as Parameters<typeof run>[0], config);
  }
  return (await appliedMigrationCount(db)) - before;
}

export function runMigrations(
  handle: Pick<DbHandle, 'db' | 'driver'>,
  options?: MigrateOptions,
): Promise<number> {
  return migrate(handle.db, handle.driver, options);
}

/** Number of migrations in the journal (what `migrate` would bring an empty database to). */
export function journaledMigrationCount(options: MigrateOptions = {}): number {
  return readMigrationFiles({ migrationsFolder: resolveMigrationsDir(options.migrationsFolder) })
    .length;
}

export interface GetDbOptions extends OpenDbOptions, MigrateOptions {
  /** Apply pending migrations when the handle is first opened. */
  migrate?: boolean;
}

export interface SharedDbHandle extends DbHandle {
  /** Migrations applied when this handle was opened (0 when not asked to migrate). */
  migrationsApplied: number;
}

type DbCache = Map<string, Promise<SharedDbHandle>>;
const CACHE_KEY = Symbol.for('reelwright.db.handles');

function cache(): DbCache {
  const store = globalThis as typeof globalThis & { [CACHE_KEY]?: DbCache };
  return (store[CACHE_KEY] ??= new Map());
}

/**
 * One handle per database for the whole process, kept on `globalThis` so that `next dev` hot
 * reloads reuse it instead of opening (and locking) the PGlite folder again.
 */
export function getDb(options: GetDbOptions = {}): Promise<SharedDbHandle> {
  const key = options.url
    ? `pg:${options.url}`
    : `pglite:${options.dataDir === MEMORY ? MEMORY : path.resolve(options.dataDir ?? defaultDataDir())}`;
  const handles = cache();
  const existing = handles.get(key);
  if (existing) return existing;

  const opening = (async () => {
    const handle = await openDb(options);
    try {
      const migrationsApplied = options.migrate
        ? await migrate(handle.db, handle.driver, options)
        : 0;
      const close = async () => {
        handles.delete(key);
        await handle.close();
      };
      return { ...handle, close, migrationsApplied };
    } catch (error) {
      await handle.close();
      throw error;
    }
  })();
  handles.set(key, opening);
  opening.catch(() => handles.delete(key));
  return opening;
}

/** Closes every handle opened through `getDb` (tests, graceful shutdown). */
export async function closeAllDbs(): Promise<void> {
  const handles = cache();
  const all = [...handles.values()];
  handles.clear();
  await Promise.allSettled(all.map(async (p) => (await p).close()));
}
