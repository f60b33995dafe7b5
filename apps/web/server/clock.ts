import { env } from '~/env';

// The app's one clock. Everything the app records or computes as "now" (check-ins, transitions,
// "today" in a shop's zone, the as-of instant of a figure, due dates) reads it here.
//
// REELWRIGHT_NOW (an ISO instant, validated in env.ts) sets the clock at start-up; it then runs
// on at the wall clock's pace, so timers and "minutes ago" behave. The end-to-end tests set it to
// the seed's "today", so the suite does not depend on the day it runs (DEVELOPERS.md, "One
// clock").
//
// Protocol timing is not business time and stays on the wall clock: session and JWT expiry,
// sign-in throttling, webhook signature tolerance, presigned URL expiry, import heartbeats and the
// mail outbox's backoff (its rows are stamped by the database).

const pinned = env.REELWRIGHT_NOW ? Date.parse(env.REELWRIGHT_NOW) : null;

// The wall-clock instant the pinned clock started, once per process: the server bundles this
// module into several chunks, and every copy must tell the same time.
const START = Symbol.for('reelwright.clock.start');
const store = globalThis as typeof globalThis & { [START]?: number };
const startedAt = (store[START] ??= Date.now());

/** The current instant as the app sees it. */
export function now(): Date {
  return pinned === null ? new Date() : new Date(pinned + (Date.now() - startedAt));
}
