import { migrate, openDb, type DbHandle } from '@reelwright/db/client';
import { freshDb, TARGET } from '@reelwright/db/test-databases';
import type { Principal } from '../principal';

// What the unit tests put in place of `~/server/db` and `~/server/session`: an in-memory PGlite
// with every migration applied, and whoever the test says is signed in. In a test file:
//
//   vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));
//   vi.mock('~/server/session', () => import('~/server/testing/memory-db').then((m) => m.sessionModule));
//   beforeAll(openMemoryDb); afterAll(closeMemoryDb);

/** The open database and the signed-in principal of the running test file. */
export const testState = {
  handle: null as DbHandle | null,
  principal: null as Principal | null,
};

export const dbModule = {
  db: async () => testState.handle!.db,
  database: async () => testState.handle!,
};

export const sessionModule = {
  getPrincipal: async () => testState.principal,
  requirePagePrincipal: async () => testState.principal,
};

/** Opens the in-memory database and applies the migrations. */
export async function openMemoryDb(): Promise<DbHandle> {
  const handle = await openDb({ dataDir: 'memory://' });
  await migrate(handle.db, handle.driver);
  testState.handle = handle;
  return handle;
}

export async function closeMemoryDb(): Promise<void> {
  await testState.handle?.close();
  testState.handle = null;
}

/** Which engine `openTargetDb` opens: PostgreSQL when TEST_DATABASE_URL is set, else PGlite. */
export const TEST_TARGET = TARGET;

/**
 * The test target with every migration applied: in-memory PGlite, or a new database on the
 * PostgreSQL server of TEST_DATABASE_URL (dropped again by closeMemoryDb).
 */
export async function openTargetDb(): Promise<DbHandle> {
  const handle = await freshDb();
  await migrate(handle.db, handle.driver);
  testState.handle = handle;
  return handle;
}
