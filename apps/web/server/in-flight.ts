import { AsyncLocalStorage } from 'node:async_hooks';

// Which API requests are being answered right now, so that background work sharing the embedded
// database's one connection (an import's chunks, see imports/turns.ts) can let them finish first:
// between two of a request's queries its connection is free, but the request is not done.

interface Entry {
  done: boolean;
}

const current = new AsyncLocalStorage<Entry>();
let inFlight = 0;

/** Runs `answer` counted as a request in flight until it returns (route() wraps every handler). */
export async function answering<T>(answer: () => Promise<T>): Promise<T> {
  const entry: Entry = { done: false };
  inFlight++;
  try {
    return await current.run(entry, answer);
  } finally {
    entry.done = true;
    inFlight--;
  }
}

/**
 * Requests in flight other than the caller's own (work streamed after its response has started
 * is no longer counted as its request).
 */
export function othersInFlight(): number {
  const own = current.getStore();
  return inFlight - (own && !own.done ? 1 : 0);
}
