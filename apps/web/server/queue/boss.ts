import { sql, type Db, type Tx } from '@reelwright/db';
import type { DbHandle } from '@reelwright/db/client';
import { fromDrizzle, fromPglite, PgBoss, type Db as IDatabase, type SendOptions } from 'pg-boss';

/**
 * The job queue: pg-boss on the app's own database, in its own schema. pg-boss does not open a
 * connection of its own: it sends its SQL through the app's drizzle handle, which under
 * `next start` is a node-postgres pool on both engines (a PostgreSQL server, or the embedded
 * PGlite served on a Unix socket with a pool of one), so the demo and production take one code
 * path. In-process PGlite (unit tests, scripts) runs pg-boss's multi-statement blocks through
 * `exec`, which `fromPglite` does.
 */

/** The queues and what each does (the handlers are in ./jobs.ts). */
export const QUEUES = {
  /** Send the outbox's due messages. Enqueued after a change that queues mail; swept each minute. */
  mail: 'mail-deliver',
  /** Apply one stored payment webhook event to its royalty invoice. */
  paymentEvent: 'payment-event',
  /** Issue a closed month's royalty invoices, one shop after another. */
  royalties: 'royalty-issue',
  /** Nudge about comebacks past their review deadline and corrective actions past due. */
  nudges: 'nudges',
  /** The weekly service-reminder run of each shop, on Monday morning in the shop's zone. */
  weeklyReminders: 'weekly-reminders',
} as const;
export type QueueName = (typeof QUEUES)[keyof typeof QUEUES];

export const QUEUE_SCHEMA = 'pgboss';

/** pg-boss's SQL, sent through whichever client the handle (or transaction) has. */
export function bossDatabase(conn: Db | Tx): IDatabase {
  const client = (conn as unknown as { $client?: { exec?: unknown; query: unknown } }).$client;
  // A PGlite instance has `exec` (node-postgres pools and clients do not).
  if (client && typeof client.exec === 'function')
    return fromPglite(client as Parameters<typeof fromPglite>[0]);
  return fromDrizzle(conn, sql);
}

export interface QueueOptions {
  /** Run pg-boss's maintenance and cron (each app instance does; pg-boss elects one at a time). */
  supervise?: boolean;
}

/**
 * Starts pg-boss on the handle: creates or migrates its schema and the queues. Instances started
 * at once can race there (pg-boss checks its schema's version before it takes its advisory lock,
 * so the second one may try to create what the first just made, and fail): a failed start is
 * stopped and tried again, up to three times, by when the schema and queues are in place.
 */
export async function startBoss(handle: DbHandle, options: QueueOptions = {}): Promise<PgBoss> {
  const supervise = options.supervise ?? true;
  for (let attempt = 1; ; attempt++) {
    const boss = new PgBoss({
      db: bossDatabase(handle.db),
      schema: QUEUE_SCHEMA,
      supervise,
      schedule: supervise,
      // Fewer background statements: on the embedded database every one takes the one connection.
      monitorIntervalSeconds: 60,
      maintenanceIntervalSeconds: 120,
    });
    boss.on('error', (error: Error) => console.error('[queue]', error.message));
    try {
      await boss.start();
      await createQueues(boss);
      return boss;
    } catch (error) {
      await boss.stop({ graceful: false, close: false }).catch(() => {});
      if (attempt >= 3) throw error;
      console.warn(
        `[queue] starting the job queue failed (${error instanceof Error ? error.message : String(error)}); trying again`,
      );
      await new Promise((resolve) => setTimeout(resolve, 500 * attempt + Math.random() * 500));
    }
  }
}

async function createQueues(boss: PgBoss): Promise<void> {
  const existing = new Set((await boss.getQueues()).map((q) => q.name));
  const create = async (name: QueueName, options: Parameters<PgBoss['createQueue']>[1]) => {
    if (!existing.has(name)) await boss.createQueue(name, options);
  };
  // A handler that throws is retried with backoff; a claimed job whose instance died is retried
  // when its lease (expireInSeconds) runs out, on whichever instance polls next.
  await create(QUEUES.mail, {
    retryLimit: 3,
    retryDelay: 5,
    retryBackoff: true,
    expireInSeconds: 300,
  });
  await create(QUEUES.paymentEvent, {
    retryLimit: 10,
    retryDelay: 10,
    retryBackoff: true,
    retryDelayMax: 3600,
    expireInSeconds: 120,
  });
  await create(QUEUES.royalties, {
    retryLimit: 5,
    retryDelay: 30,
    retryBackoff: true,
    expireInSeconds: 900,
  });
  await create(QUEUES.nudges, { retryLimit: 2, retryDelay: 60, expireInSeconds: 600 });
  await create(QUEUES.weeklyReminders, { retryLimit: 2, retryDelay: 60, expireInSeconds: 1800 });
}

const BOSS = Symbol.for('reelwright.queue.boss');
type BossStore = typeof globalThis & { [BOSS]?: Promise<PgBoss> };

/** The process's pg-boss (started once, kept across `next dev` reloads). */
export function processBoss(
  open: () => Promise<DbHandle>,
  options?: QueueOptions,
): Promise<PgBoss> {
  const store = globalThis as BossStore;
  const starting = (store[BOSS] ??= open().then((handle) => startBoss(handle, options)));
  starting.catch(() => {
    if (store[BOSS] === starting) delete store[BOSS];
  });
  return starting;
}

/** Stops the process's pg-boss (tests, shutdown). */
export async function stopProcessBoss(): Promise<void> {
  const store = globalThis as BossStore;
  const starting = store[BOSS];
  delete store[BOSS];
  if (starting) await (await starting).stop({ graceful: true, timeout: 10_000, close: false });
}

export interface EnqueueOptions extends Pick<SendOptions, 'singletonKey' | 'startAfter'> {
  /** Enqueue inside this transaction: the job exists exactly when the change commits. */
  tx?: Tx;
}

export async function enqueueOn(
  boss: PgBoss,
  name: QueueName,
  data: object,
  options: EnqueueOptions = {},
): Promise<string | null> {
  const { tx, ...send } = options;
  return boss.send(name, data, { ...send, ...(tx && { db: bossDatabase(tx) }) });
}
