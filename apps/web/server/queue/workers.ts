import type { PgBoss } from 'pg-boss';
import { db } from '../db';
import { deliverPending } from '../mail/outbox';
import { processPaymentEvents } from '../payments/webhook';
import { QUEUES, type QueueName } from './boss';
import { sendNudges } from './nudges';
import { issueRequestedRoyalties } from './royalties';
import { runWeeklyReminders } from './weekly-reminders';

export interface WorkerContext {
  /** For links in e-mails (reminders' unsubscribe links, nudges' links). */
  baseUrl: string | null;
  /** Business time (the app's one clock). */
  now: () => Date;
}

/**
 * The handlers of every queue, as this instance runs them. Each is idempotent (its effect is keyed
 * by the rows it works from), so a retry, a sweep and a job given to another instance after a
 * lease ran out change nothing twice.
 */
export function handlers(
  context: WorkerContext,
): Record<QueueName, (data: JobData) => Promise<unknown>> {
  return {
    [QUEUES.mail]: async () => {
      // Each call sends up to 50; keep going while full batches go out.
      let total = 0;
      for (let round = 0; round < 20; round++) {
        const result = await deliverPending();
        total += result.sent + result.failed;
        if (result.skipped || result.sent + result.failed < 50) break;
      }
      return { handled: total };
    },
    [QUEUES.paymentEvent]: async (data) => ({
      applied: await processPaymentEvents(await db(), data.eventId),
    }),
    [QUEUES.royalties]: async (data) => issueRequestedRoyalties(await db(), data.month),
    [QUEUES.nudges]: async () =>
      sendNudges(await db(), context.now(), { baseUrl: context.baseUrl }),
    [QUEUES.weeklyReminders]: async () =>
      runWeeklyReminders(await db(), context.now(), {
        baseUrl: context.baseUrl ?? 'http://localhost:3000',
      }),
  };
}

export interface JobData {
  eventId?: number;
  month?: string;
}

/** Polling, in seconds: a local enqueue wakes the worker at once, so this is the cross-instance pace. */
const POLL: Record<QueueName, number> = {
  [QUEUES.mail]: 5,
  [QUEUES.paymentEvent]: 5,
  [QUEUES.royalties]: 5,
  [QUEUES.nudges]: 60,
  [QUEUES.weeklyReminders]: 60,
};

/**
 * What runs by the clock (cron in UTC; pg-boss fires each once per slot across all instances):
 * the minute's sweeps find work whose enqueue was lost, and the hourly runs take their business
 * decisions (a shop's Monday morning, "past due") in each shop's zone from the app's clock.
 */
const SCHEDULES: [QueueName, string][] = [
  [QUEUES.mail, '* * * * *'],
  [QUEUES.paymentEvent, '* * * * *'],
  [QUEUES.royalties, '* * * * *'],
  [QUEUES.nudges, '5 * * * *'],
  [QUEUES.weeklyReminders, '10 * * * *'],
];

const WORKERS = Symbol.for('reelwright.queue.workers');
type Store = typeof globalThis & { [WORKERS]?: Map<QueueName, string> };

export async function registerWorkers(boss: PgBoss, context: WorkerContext): Promise<void> {
  const run = handlers(context);
  const ids = ((globalThis as Store)[WORKERS] ??= new Map());
  for (const name of Object.values(QUEUES)) {
    const id = await boss.work<JobData>(
      name,
      { pollingIntervalSeconds: POLL[name], batchSize: 1 },
      async ([job]) => run[name](job?.data ?? {}),
    );
    ids.set(name, id);
  }
  for (const [name, cron] of SCHEDULES) await boss.schedule(name, cron);
}

/** Wakes this instance's worker of the queue now instead of at its next poll. */
export function wakeWorker(boss: PgBoss, name: QueueName): void {
  const id = (globalThis as Store)[WORKERS]?.get(name);
  if (id) boss.notifyWorker(id);
}
