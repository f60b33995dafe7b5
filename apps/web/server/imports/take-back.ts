import { and, eq, isNull, lt, or, sql } from '@reelwright/db';
import { customers, importBatches, jobs, reels } from '@reelwright/db/schema';
import * as clock from '~/server/clock';
import { db } from '../db';
import { yieldToEventLoop } from './prepare';

// Taking an import's rows back out: after a failure part-way, and at start-up for imports a
// stopped server left half-written (the batch's rows are marked with its id).

/** An import whose heartbeat is older than this was cut off (a chunk commits within seconds). */
export const ABANDONED_AFTER_MS = 2 * 60_000;

/** Jobs deleted per statement while taking an import back. */
const TAKE_BACK_CHUNK = 100;

/**
 * Takes an import's rows back out, a chunk of jobs at a time (their timeline and bench time go
 * with them), then the reels and customers it created, and marks the batch failed with `reason`.
 * A row someone has meanwhile tied to other records stays, and the log says so.
 */
export async function takeBack(batchId: number, reason: string) {
  const conn = await db();
  try {
    for (;;) {
      const { rows } = await conn.execute<{ id: number }>(
        sql`delete from ${jobs} where ${jobs.id} in (
              select ${jobs.id} from ${jobs} where ${jobs.importBatchId} = ${batchId} limit ${TAKE_BACK_CHUNK})
            returning ${jobs.id}`,
      );
      if (rows.length === 0) break;
      await yieldToEventLoop();
    }
    await conn.delete(reels).where(eq(reels.importBatchId, batchId));
    await conn.delete(customers).where(eq(customers.importBatchId, batchId));
  } catch (error) {
    console.error(`[import] taking back import #${batchId} left rows behind:`, error);
  }
  await conn
    .update(importBatches)
    .set({
      status: 'failed',
      importedCount: 0,
      heartbeatAt: null,
      completedAt: clock.now(),
      errors: [{ row: 0, message: `${reason}; nothing was kept.` }],
    })
    .where(eq(importBatches.id, batchId));
}

/**
 * Imports cut off part-way (the server stopped while one ran) are taken back: with a PostgreSQL
 * server, those whose heartbeat stopped; at start-up on the embedded database, every one, since
 * nothing else can be writing it. Returns how many were taken back.
 */
export async function takeBackAbandonedImports(options: { all?: boolean } = {}): Promise<number> {
  const conn = await db();
  const cutoff = new Date(Date.now() - ABANDONED_AFTER_MS);
  const abandoned = await conn
    .select({ id: importBatches.id })
    .from(importBatches)
    .where(
      and(
        eq(importBatches.status, 'importing'),
        options.all
          ? undefined
          : or(isNull(importBatches.heartbeatAt), lt(importBatches.heartbeatAt, cutoff)),
      ),
    );
  for (const { id } of abandoned) {
    console.warn(`[import] import #${id} was cut off part-way; taking its rows back out`);
    await takeBack(id, 'The server stopped during the import');
  }
  return abandoned.length;
}
