import { getDb } from '@reelwright/db/client';
import { env } from '~/env';

/**
 * The process-wide database handle: PostgreSQL when DATABASE_URL is set, else PGlite on a folder,
 * run in a worker thread so that a long import or query does not stall other requests.
 */
export async function database() {
  return getDb({ url: env.DATABASE_URL, dataDir: env.PGLITE_DATA_DIR, isolate: true });
}

export async function db() {
  return (await database()).db;
}
