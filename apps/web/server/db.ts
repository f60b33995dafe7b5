import { getDb } from '@reelwright/db/client';
import { env } from '~/env';

/** The process-wide database handle (PGlite on a folder, or PostgreSQL when DATABASE_URL is set). */
export async function database() {
  return getDb({ url: env.DATABASE_URL, dataDir: env.PGLITE_DATA_DIR });
}

export async function db() {
  return (await database()).db;
}
