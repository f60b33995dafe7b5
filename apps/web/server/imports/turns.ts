import { sql, type Db } from '@reelwright/db';
import { othersWaiting } from '@reelwright/db/client';
import {
  benchSessions,
  customers,
  jobEvents,
  jobs,
  reels,
  shopMonthFigures,
} from '@reelwright/db/schema';
import { othersInFlight } from '../in-flight';
import { yieldToEventLoop } from './prepare';

// Sharing the web server's one embedded-database connection with other users' requests while an
// import runs: giving way before each chunk, a turn for the event loop between slices of work in
// memory, and the statistics refresh after the load, a statement a turn.

/** Rows looked at between two turns for the event loop, where the import only works in memory. */
const ROWS_PER_TURN = 2000;

/** The longest the import waits for a quiet moment before its next chunk (it is never starved). */
const GIVE_WAY_MAX_MS = 40;
/** How long the database must stay free and no request be in flight before a chunk is taken. */
const QUIET_MS = 2;
const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Before each chunk, requests being answered go first (the web server's PGlite has one
 * connection; see `othersWaiting`): an import is background work. A request is waited for until
 * it is done, not only while it holds the connection: between two of its queries it is working
 * on the server's thread, and a chunk taken then would hold up its next query.
 */
export async function giveWay(conn: Db) {
  const busy = () => othersWaiting(conn) || othersInFlight() > 0;
  const until = performance.now() + GIVE_WAY_MAX_MS;
  while (performance.now() < until) {
    if (!busy()) {
      await sleep(QUIET_MS);
      if (!busy()) return;
    } else {
      await sleep(1);
    }
  }
}

/** Calls `visit` for every row, handing the event loop a turn every few thousand rows. */
export async function inTurns<T>(rows: readonly T[], visit: (row: T) => void) {
  for (let i = 0; i < rows.length; i += ROWS_PER_TURN) {
    for (const row of rows.slice(i, i + ROWS_PER_TURN)) visit(row);
    await yieldToEventLoop();
  }
}

export function slices<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

/**
 * After a bulk load: the visibility map of the tables it wrote (the monthly figures its triggers
 * rewrote among them), so the network view's index-only scans skip the heap (PGlite has no
 * autovacuum, and a server's comes later), and planner statistics for the columns the screens
 * filter and join on, from a sample of 9,000 rows (statistics target 30) rather than 30,000: a
 * whole-table ANALYZE of the jobs at the default holds the embedded database for over half a
 * second. Each statement is its own turn, so that other requests are answered between them.
 * VACUUM cannot run in a transaction. The import has committed by now, so a failure is logged,
 * not reported.
 */
export async function refreshAfterBulkLoad(conn: Db) {
  const columns = [
    [jobs, sql`(shop_id, state, technician_id, checked_in_at, ready_at, collected_at)`],
    [jobEvents, sql`(job_id, at)`],
    [benchSessions, sql`(job_id, technician_id)`],
    [customers, sql`(shop_id)`],
    [reels, sql`(customer_id)`],
    [shopMonthFigures, sql``],
  ] as const;
  const steps = columns.flatMap(([table, which]) => [
    () => conn.execute(sql`vacuum ${table}`),
    () =>
      conn.transaction(async (tx) => {
        await tx.execute(sql`set local default_statistics_target = 30`);
        await tx.execute(sql`analyze ${table} ${which}`);
      }),
  ]);
  for (const step of steps) {
    await giveWay(conn);
    try {
      await step();
    } catch (error) {
      console.warn('[import] refreshing statistics after the import failed:', error);
      return;
    }
    await yieldToEventLoop();
  }
}
