import type { Tx } from '@reelwright/db';
import type { PgBoss } from 'pg-boss';
import { env } from '~/env';
import { database } from '../db';
import { deliverPending } from '../mail/outbox';
import * as clock from '../clock';
import { QUEUES, enqueueOn, processBoss, type EnqueueOptions, type QueueName } from './boss';
import { registerWorkers, wakeWorker } from './workers';

export { QUEUES } from './boss';

const STARTED = Symbol.for('reelwright.queue.started');
type Store = typeof globalThis & { [STARTED]?: Promise<PgBoss> };

/**
 * Starts the queue and this instance's workers (from instrumentation.ts, once per `next start`).
 * Every instance runs the same workers: pg-boss hands each job to one of them (`skip locked`),
 * elects one instance at a time for its cron and maintenance, and gives a job whose instance died
 * to another when its lease expires. No separate worker process: each job is short, and the
 * embedded database can only be opened by one process anyway.
 */
export function startQueue(): Promise<PgBoss> {
  const store = globalThis as Store;
  return (store[STARTED] ??= (async () => {
    const boss = await processBoss(database);
    await registerWorkers(boss, {
      baseUrl: env.APP_BASE_URL ?? env.NEXTAUTH_URL ?? null,
      now: () => clock.now(),
    });
    return boss;
  })());
}

/**
 * Puts a job on the queue when this process runs one (a server); in a script or a unit test it
 * does nothing and returns null. Nothing depends on the job alone: the rows it works from (the
 * outbox, stored payment events, a requested month) are swept every minute by the same queue, so
 * work committed by an instance that died before enqueueing is still done.
 */
export async function enqueue(
  name: QueueName,
  data: object = {},
  options: EnqueueOptions = {},
): Promise<string | null> {
  const started = (globalThis as Store)[STARTED];
  if (!started) return null;
  try {
    const boss = await started;
    const id = await enqueueOn(boss, name, data, options);
    wakeWorker(boss, name);
    return id;
  } catch (error) {
    console.error(
      `[queue] could not enqueue ${name}:`,
      error instanceof Error ? error.message : error,
    );
    return null;
  }
}

/** Enqueue inside a transaction (the job exists exactly when it commits). */
export const enqueueIn = (tx: Tx, name: QueueName, data: object = {}) =>
  enqueue(name, data, { tx });

/**
 * Sends the outbox's due messages soon: a job this instance's worker is woken for, or, in a
 * process without the queue (scripts, unit tests), a delivery run here. Claiming rows with `skip
 * locked` keeps either from sending a message twice.
 */
export async function deliverMailSoon(): Promise<void> {
  if ((await enqueue(QUEUES.mail)) === null) await deliverPending();
}
