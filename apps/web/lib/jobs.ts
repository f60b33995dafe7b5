// The job's closed sets and rules, free of zod and the database code, so that pages in the
// browser can use them; lib/validators/jobs.ts builds the request schemas from them.
import { REEL_KINDS, SERVICE_TYPES } from '@reelwright/db/values';
import type { JobState } from './labels';

export { REEL_KINDS, SERVICE_TYPES };
export type ServiceType = (typeof SERVICE_TYPES)[number];
export type ReelKind = (typeof REEL_KINDS)[number];

/** The only moves a job may make; anything else is refused with 409. */
export const NEXT_STATES: Record<JobState, readonly JobState[]> = {
  checked_in: ['on_bench'],
  on_bench: ['waiting_parts', 'ready'],
  waiting_parts: ['on_bench'],
  ready: ['collected'],
  collected: [],
};

export const OPEN_STATES: readonly JobState[] = [
  'checked_in',
  'on_bench',
  'waiting_parts',
  'ready',
];

export const canMove = (from: JobState, to: JobState) => NEXT_STATES[from].includes(to);

export const SORTS = ['checkedInAt', 'promisedAt', 'stateChangedAt', 'customer', 'id'] as const;
export type JobSort = (typeof SORTS)[number];
export const PAGE_SIZES = [25, 50, 100] as const;

/** "12.50" or "12" → 1250 cents; undefined when it is not a money amount. */
export function parseMoney(text: string): number | undefined {
  const m = /^\s*\$?\s*(\d{1,7})(?:\.(\d{1,2}))?\s*$/.exec(text);
  if (!m) return undefined;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}
