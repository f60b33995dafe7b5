import { sql, type Assume } from 'drizzle-orm';
import { readMigrationFiles } from 'drizzle-orm/migrator';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import type { Pool as PgPool } from 'pg';
import { Worker } from 'node:worker_threads';
import { lockDataDir, type FolderLock } from './lock';
import { defaultDataDir, packageDir, resolveMigrationsDir } from './paths';
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
  /**
   * PGlite only: run the database in a worker thread behind a PostgreSQL-protocol socket, and
   * talk to it through node-postgres, so that long statements do not hold up this thread's
   * event loop (the web server). In-process otherwise (scripts and tests).
   */
  isolate?: boolean;
}

export interface DbHandle {
  db: Db;
  driver: Driver;
  /** The postgres:// URL, for PostgreSQL. */
  url?: string;
  /** The PGlite folder (absolute) or 'memory://'; undefined for PostgreSQL. */
  dataDir?: string;
  close(): Promise<void>;
}

export const MEMORY = 'memory://';

export async function openDb(options: OpenDbOptions = {}): Promise<DbHandle> {
  if (options.url) return openPg(options.url, options.maxConnections ?? 10);
  const dataDir = options.dataDir ?? defaultDataDir();
  return options.isolate ? openIsolatedPglite(dataDir) : openPglite(dataDir);
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
    url,
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

/**
 * PGlite in a worker thread, served over a Unix socket in a private folder by
 * @electric-sql/pglite-socket; this thread holds the folder's lock (the worker dies with the
 * process) and reaches the database through a node-postgres pool of ONE connection: PGlite is a
 * single session, so requests take turns at the pool, and a transaction holds the database only
 * while it runs. Work that must not block others commits in short transactions.
 */
async function openIsolatedPglite(dataDir: string): Promise<DbHandle> {
  const memory = dataDir === MEMORY;
  const folder = memory ? MEMORY : path.resolve(dataDir);
  const lock: FolderLock | null = memory ? null : await lockDataDir(folder);
  const socketDir = mkdtempSync(path.join(os.tmpdir(), 'reelwright-pglite-'));
  let worker: PgliteWorker | null = null;
  try {
    worker = await startPgliteWorker(folder, socketDir);
    const [{ default: pg }, { drizzle }] = await Promise.all([
      import('pg'),
      import('drizzle-orm/node-postgres'),
    ]);
    // The socket file is `<host>/.s.PGSQL.<port>`, as a PostgreSQL server's.
    const pool = new pg.Pool({
      host: socketDir,
      port: SOCKET_PORT,
      user: 'postgres',
      max: 1,
      // The one connection stays open; a caller waiting a minute for it has found a bug (a query
      // sent outside a transaction that is waiting for it) and gets an error, not a hang.
      idleTimeoutMillis: 0,
      connectionTimeoutMillis: 60_000,
    });
    pool.on('error', (error) => console.error('[db] embedded database connection:', error.message));
    const db = drizzle({ client: pool, schema }) as unknown as Db;
    const running = worker;
    let closed = false;
    return {
      db,
      driver: 'pglite',
      dataDir: folder,
      async close() {
        if (closed) return;
        closed = true;
        try {
          await pool.end();
          await running.stop();
        } finally {
          rmSync(socketDir, { recursive: true, force: true });
          lock?.release();
        }
      },
    };
  } catch (error) {
    await worker?.stop().catch(() => {});
    rmSync(socketDir, { recursive: true, force: true });
    lock?.release();
    throw error;
  }
}

const SOCKET_PORT = 5432;

// The worker: open PGlite, serve it on the socket, and close it cleanly when asked. Modules are
// imported by absolute path, resolved from this package, since an eval'd worker has no package.
const PGLITE_WORKER = `
const { workerData, parentPort } = require('node:worker_threads');
const { pathToFileURL } = require('node:url');
(async () => {
  const { PGlite } = await import(pathToFileURL(workerData.pglite).href);
  const { PGLiteSocketServer } = await import(pathToFileURL(workerData.socket).href);
  const db = workerData.dataDir === 'memory://' ? await PGlite.create() : await PGlite.create(workerData.dataDir);
  const server = new PGLiteSocketServer({ db, path: workerData.path, maxConnections: 64 });
  await server.start();
  parentPort.on('message', async (message) => {
    if (message !== 'stop') return;
    try {
      await server.stop();
      await db.close();
      parentPort.postMessage({ stopped: true });
    } catch (error) {
      parentPort.postMessage({ stopped: true, error: String(error && error.message || error) });
    }
  });
  parentPort.postMessage({ ready: true });
})().catch((error) => parentPort.postMessage({ error: String(error && error.stack || error) }));
`;

interface PgliteWorker {
  stop(): Promise<void>;
}

function startPgliteWorker(dataDir: string, socketDir: string): Promise<PgliteWorker> {
  const resolve = createRequire(
    path.join(/* turbopackIgnore: true */ packageDir(), 'package.json'),
  ).resolve;
  const worker = new Worker(PGLITE_WORKER, {
    eval: true,
    workerData: {
      dataDir,
      path: path.join(/* turbopackIgnore: true */ socketDir, `.s.PGSQL.${SOCKET_PORT}`),
      pglite: resolve('@electric-sql/pglite'),
      socket: resolve('@electric-sql/pglite-socket'),
    },
  });
  let stopping: Promise<void> | null = null;
  const stop = () =>
    (stopping ??= new Promise<void>((done) => {
      const timer = setTimeout(() => void worker.terminate().then(() => done()), 10_000);
      worker.once('exit', () => {
        clearTimeout(timer);
        done();
      });
      worker.on('message', (message: { stopped?: boolean; error?: string }) => {
        if (!message.stopped) return;
        if (message.error) console.error('[db] closing the embedded database:', message.error);
        void worker.terminate();
      });
      worker.postMessage('stop');
    }));
  return new Promise((ready, fail) => {
    worker.on('message', (message: { ready?: boolean; error?: string }) => {
      if (message.ready) ready({ stop });
      else if (message.error) {
        void worker.terminate();
        fail(new Error(`The embedded database did not start: ${message.error}`));
      }
    });
    worker.once('error', (error) => fail(error));
    worker.once('exit', (code) => {
      fail(new Error(`The embedded database stopped (worker exit ${code}).`));
      if (!stopping) console.error(`[db] the embedded database stopped (worker exit ${code})`);
    });
  });
}

/**
 * Whether other callers are using or waiting for the database right now: on the web server's
 * embedded database (one connection, see `openIsolatedPglite`) background work checks this
 * between its short transactions and lets requests go first. Always false in-process, where
 * nothing else can run meanwhile, and on a PostgreSQL server, whose pool has room.
 */
export function othersWaiting(db: Db): boolean {
  const pool = (db as unknown as { $client?: Partial<PgPool> & { options?: { max?: number } } })
    .$client;
  if (!pool || typeof pool.waitingCount !== 'number' || pool.options?.max !== 1) return false;
  const active = (pool.totalCount ?? 0) - (pool.idleCount ?? 0);
  return pool.waitingCount > 0 || active > 0;
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

/** The advisory lock that lets one instance at a time migrate a PostgreSQL server. */
const MIGRATION_LOCK = 20260303;

/**
 * Applies the journaled migrations not yet applied, in one transaction; returns how many ran. On
 * a PostgreSQL server the run holds an advisory lock, so instances starting at once apply each
 * migration once: the others wait, then find nothing left to apply. (The embedded database is
 * held by one process, its folder lock says so.)
 */
export async function migrate(
  db: Db,
  driver: Driver,
  options: MigrateOptions = {},
): Promise<number> {
  const migrationsFolder = resolveMigrationsDir(options.migrationsFolder);
  const config = {
    migrationsFolder,
    migrationsSchema: MIGRATIONS_SCHEMA,
    migrationsTable: MIGRATIONS_TABLE,
  };
  const run = async () => {
    const before = await appliedMigrationCount(db);
    if (driver === 'pglite') {
      const { migrate: apply } = await import('drizzle-orm/pglite/migrator');
      await apply(db as unknown as Parameters<typeof apply>[0], config);
    } else {
      const { migrate: apply } = await import('drizzle-orm/node-postgres/migrator');
      await apply(db as unknown as Parameters<typeof apply>[0], config);
    }
    return (await appliedMigrationCount(db)) - before;
  };
  if (driver !== 'pg') return run();
  const pool = (db as unknown as { $client: PgPool }).$client;
  const holder = await pool.connect();
  try {
    await holder.query('select pg_advisory_lock($1)', [MIGRATION_LOCK]);
    return await run();
  } finally {
    await holder.query('select pg_advisory_unlock($1)', [MIGRATION_LOCK]).catch(() => {});
    holder.release();
  }
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
