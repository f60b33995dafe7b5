import { Worker } from 'node:worker_threads';
import { env } from '~/env';
import {
  checkFile,
  type CheckedRow,
  type CheckInput,
  type CheckMessage,
  type CheckResult,
} from './check';

// Runs the import's file check (check.ts) off the web server's thread.

/**
 * Under `next start` and `next dev`, in a worker thread at low priority (the bundler builds the
 * worker from check.worker.ts), its rows handed over two hundred at a time, each piece asked for
 * once the last one is taken. Under the unit tests there is no bundled worker to start, and no
 * request waiting: the check runs in place.
 */
export function checkFileOffThread(input: CheckInput): Promise<CheckResult> {
  if (env.NODE_ENV === 'test') return Promise.resolve(checkFile(input));
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL('./check.worker.ts', import.meta.url), {
      workerData: input,
      // A roomier young generation: checking 66,000 rows allocates briskly, and with the default
      // a third of the thread's time went to collecting it.
      resourceLimits: { maxYoungGenerationSizeMb: 48 },
    });
    const valid: CheckedRow[] = [];
    let settled = false;
    const settle = (fn: () => void) => {
      if (settled) return;
      settled = true;
      fn();
      void worker.terminate();
    };
    worker.on('message', (message: CheckMessage) => {
      if ('rows' in message) {
        for (const row of message.rows) valid.push(row);
        // The next piece after a turn for whatever else is waiting.
        setImmediate(() => worker.postMessage('next'));
      } else if ('done' in message) {
        settle(() => resolve({ ...message.done, valid }));
      } else {
        settle(() => reject(new Error(`Checking the file failed: ${message.failed}`)));
      }
    });
    worker.once('error', (error) => settle(() => reject(error)));
    worker.once('exit', (code) =>
      settle(() => reject(new Error(`The file check stopped (worker exit ${code}).`))),
    );
  });
}
