import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { MEMORY, openDb, type DbHandle } from '../client';

/** Set by the test command for its second run against a throwaway PostgreSQL 15 server. */
export const TEST_DATABASE_URL = process.env.TEST_DATABASE_URL || undefined;
export const TARGET: 'pglite' | 'pg' = TEST_DATABASE_URL ? 'pg' : 'pglite';

function withDatabase(url: string, database: string): string {
  const u = new URL(url);
  u.pathname = `/${database}`;
  return u.toString();
}

async function admin<T>(run: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: TEST_DATABASE_URL });
  await client.connect();
  try {
    return await run(client);
  } finally {
    await client.end();
  }
}

/**
 * An empty database on the test target: in-memory PGlite, or a new database on the
 * PostgreSQL server, dropped on close so reruns start clean.
 */
export async function freshDb(target: 'pglite' | 'pg' = TARGET): Promise<DbHandle> {
  if (target === 'pglite' || !TEST_DATABASE_URL) return openDb({ dataDir: MEMORY });
  const name = `reelwright_test_${randomUUID().replace(/-/g, '').slice(0, 16)}`;
  await admin((c) => c.query(`create database "${name}"`));
  const handle = await openDb({ url: withDatabase(TEST_DATABASE_URL, name), maxConnections: 4 });
  return {
    ...handle,
    async close() {
      await handle.close();
      await admin((c) => c.query(`drop database if exists "${name}" with (force)`));
    },
  };
}
