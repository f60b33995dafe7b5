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
  // In pieces, each sent when the server's thread asks for it: posted all at once, they would be
  // taken in one go (a second of decoding on that thread), not in turn with requests.
  let next = 0;
  const send = () => {
    if (next < valid.length) {
      post({ rows: valid.slice(next, next + CHECKED_PIECE) });
      next += CHECKED_PIECE;
    } else {
      post({ done: rest });
    }
  };
  parentPort!.on('message', send);
  send();
} catch (error) {
  post({ failed: error instanceof Error ? error.message : String(error) });
}
