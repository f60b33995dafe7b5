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
// sign-in throttling, webhook signature tolerance, presigned URL expiry and import heartbeats.

const pinned = env.REELWRIGHT_NOW ? Date.parse(env.REELWRIGHT_NOW) : null;
const startedAt = performance.now();

/** The current instant as the app sees it. */
export function now(): Date {
  return pinned === null ? new Date() : new Date(pinned + (performance.now() - startedAt));
}
