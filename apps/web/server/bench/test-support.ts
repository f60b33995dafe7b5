import { expect } from 'vitest';
import type { JobState } from '~/lib/labels';
import type { CheckInInput } from '~/lib/validators/jobs';
import { ApiError } from '../errors';
import { checkIn } from './check-in';
import type { Network } from './fixture';
import { transitionJob } from './jobs';

// What the bench unit tests share: times at the fixture's New York shops, and jobs made to order.

// Monday 2 November 2026, after the autumn clock change: New York is UTC−5.
export const est = (day: number, clock: string) => {
  const [h, m] = clock.split(':').map(Number) as [number, number];
  return new Date(Date.UTC(2026, 10, day, h + 5, m));
};
export const MON = est(2, '10:00');

export async function expectApiError(promise: Promise<unknown>, status: number) {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error, `expected a ${status}`).toBeInstanceOf(ApiError);
  expect((error as ApiError).status).toBe(status);
  return error as ApiError;
}

/** Check-in bodies and jobs at a given state, for the network the test file built. */
export function jobMaker(network: () => Network) {
  const checkInBody = (over: Partial<CheckInInput> = {}): CheckInInput => ({
    customer: { id: network().customers.ada.id },
    reel: { id: network().reels.ada.id },
    serviceType: 'tune_up',
    promisedOn: '2026-11-06',
    ...over,
  });

  async function newJob(over: Partial<CheckInInput> = {}, now = MON, who = network().as.tech) {
    const { id } = await checkIn(who, checkInBody(over), { now });
    return id;
  }

  /** Walks a fresh job along the allowed path to `target`. */
  async function jobIn(target: JobState) {
    const id = await newJob();
    const path: JobState[] = ['on_bench', 'waiting_parts', 'on_bench', 'ready', 'collected'];
    const stopAfter: Record<JobState, number> = {
      checked_in: 0,
      on_bench: 1,
      waiting_parts: 2,
      ready: 4,
      collected: 5,
    };
    let t = MON.getTime();
    for (const to of path.slice(0, stopAfter[target])) {
      t += 3_600_000;
      await transitionJob(network().as.tech, id, { to, reason: 'Test job' }, { now: new Date(t) });
    }
    return id;
  }

  return { checkInBody, newJob, jobIn };
}
