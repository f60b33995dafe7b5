// COPY of the rows an import wrote, timed on the same engine with the same triggers and indexes:
// the yardstick of `pnpm bench:responsiveness` (responsiveness.ts).
import { chmodSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { PGlite } from '@electric-sql/pglite';
import { openDb } from '@reelwright/db/client';

export const IMPORTED_TABLES = [
  'customers',
  'reels',
  'jobs',
  'job_events',
  'bench_sessions',
] as const;

function importedRows(batchId: number): Record<(typeof IMPORTED_TABLES)[number], string> {
  const jobs = `select id from jobs where import_batch_id = ${batchId}`;
  return {
    customers: `import_batch_id = ${batchId}`,
    reels: `import_batch_id = ${batchId}`,
    jobs: `import_batch_id = ${batchId}`,
    job_events: `job_id in (${jobs})`,
    bench_sessions: `job_id in (${jobs})`,
  };
}

/**
 * COPY of the rows the import wrote, into the same tables with their triggers and indexes, on the
 * same engine: the rows are read out as CSV, deleted and copied back inside a transaction that is
 * rolled back. Only the COPY statements are timed.
 */
export async function timeCopyPglite(dataDir: string, batchId: number) {
  const handle = await openDb({ dataDir });
  try {
    const client = (handle.db as unknown as { $client: PGlite }).$client;
    const where = importedRows(batchId);
    const blobs = new Map<string, Blob>();
    let rows = 0;
    for (const table of IMPORTED_TABLES) {
      const out = await client.query(
        `copy (select * from ${table} where ${where[table]}) to '/dev/blob' with (format csv)`,
      );
      blobs.set(table, out.blob!);
      rows += out.affectedRows ?? 0;
    }
    let copyMs = 0;
    await client.transaction(async (tx) => {
      // The deletes only make room (and are rolled back): without triggers, so that neither the
      // foreign-key checks nor the figures are paid for them.
      await tx.query('set local session_replication_role = replica');
      for (const table of [...IMPORTED_TABLES].reverse()) {
        await tx.query(`delete from ${table} where ${where[table]}`);
      }
      await tx.query('set local session_replication_role = origin');
      for (const table of IMPORTED_TABLES) {
        const t0 = performance.now();
        await tx.query(`copy ${table} from '/dev/blob' with (format csv)`, [], {
          blob: blobs.get(table)!,
        });
        copyMs += performance.now() - t0;
      }
      await tx.rollback();
    });
    return { rows, copyMs };
  } finally {
    await handle.close();
  }
}

interface PgClient {
  query(text: string): Promise<{ rowCount: number | null }>;
  release(): void;
}

/** The same on a PostgreSQL server on this machine, through server-side files (superuser). */
export async function timeCopyPg(url: string, batchId: number) {
  const handle = await openDb({ url, maxConnections: 1 });
  const pool = (handle.db as unknown as { $client: { connect(): Promise<PgClient> } }).$client;
  const client = await pool.connect();
  const dir = mkdtempSync(path.join(tmpdir(), 'rw-copy-'));
  chmodSync(dir, 0o777);
  try {
    const where = importedRows(batchId);
    let rows = 0;
    for (const table of IMPORTED_TABLES) {
      const out = await client.query(
        `copy (select * from ${table} where ${where[table]}) to '${dir}/${table}.csv' with (format csv)`,
      );
      rows += out.rowCount ?? 0;
    }
    let copyMs = 0;
    await client.query('begin');
    await client.query('set local session_replication_role = replica');
    for (const table of [...IMPORTED_TABLES].reverse()) {
      await client.query(`delete from ${table} where ${where[table]}`);
    }
    await client.query('set local session_replication_role = origin');
    for (const table of IMPORTED_TABLES) {
      const t0 = performance.now();
      await client.query(`copy ${table} from '${dir}/${table}.csv' with (format csv)`);
      copyMs += performance.now() - t0;
    }
    await client.query('rollback');
    return { rows, copyMs };
  } finally {
    client.release();
    await handle.close();
    rmSync(dir, { recursive: true, force: true });
  }
}
