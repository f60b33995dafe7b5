import { setPriority } from 'node:os';
import { parentPort, workerData } from 'node:worker_threads';
import { CHECKED_PIECE, checkFile, type CheckInput, type CheckMessage } from './check';

// The import's file check in its own thread (started by check-thread.ts). On Linux the nice
// value is the thread's own: the check gives way to the threads answering requests.
try {
  setPriority(19);
} catch {
  // Not permitted here: the check runs at the normal priority.
}

const post = (message: CheckMessage) => parentPort!.postMessage(message);
try {
  const { valid, ...rest } = checkFile(workerData as CheckInput);
  // In pieces, so that the server's thread takes them in turn between requests.
  for (let i = 0; i < valid.length; i += CHECKED_PIECE) {
    post({ rows: valid.slice(i, i + CHECKED_PIECE) });
  }
  post({ done: rest });
} catch (error) {
  post({ failed: error instanceof Error ? error.message : String(error) });
}
