import { businessMinutes, businessMinutesMs, type ShopCalendar } from './business-time';
import { quantileSorted } from './quantile';

/** A spell spent waiting on parts; `to: null` means still waiting (clipped at ready). */
export interface WaitingSpan {
  from: Date;
  to: Date | null;
}

export interface TurnaroundInput {
  checkedInAt: Date;
  readyAt: Date;
  waitingSpans: readonly WaitingSpan[];
}

export interface JobTurnaround {
  customerMinutes: number;
  benchMinutes: number;
  waitingMinutes: number;
}

/**
 * Turnaround of one job, in business minutes (README, figures table):
 * customer = businessMinutes(checkedInAt, readyAt); waiting = business minutes inside the
 * waiting-on-parts spells, each clipped to [checkedInAt, readyAt) and merged where they
 * overlap so no minute counts twice; bench = customer − waiting.
 *
 * A job ready before it was checked in gives zeros. Spells outside the job, or empty, count 0.
 */
export function jobTurnaround(job: TurnaroundInput, calendar: ShopCalendar): JobTurnaround {
  const start = job.checkedInAt.getTime();
  const end = job.readyAt.getTime();
  const customerMinutes = businessMinutes(job.checkedInAt, job.readyAt, calendar);
  const clipped: [number, number][] = [];
  for (const spell of job.waitingSpans) {
    const a = Math.max(spell.from.getTime(), start);
    const b = Math.min(spell.to === null ? end : spell.to.getTime(), end);
    if (b > a) clipped.push([a, b]);
  }
  if (clipped.length > 1) clipped.sort((x, y) => x[0] - y[0]);
  let waitingMinutes = 0;
  let curA = 0;
  let curB = -Infinity;
  for (const [a, b] of clipped) {
    if (a <= curB) {
      curB = Math.max(curB, b);
      continue;
    }
    if (curB > curA) waitingMinutes += businessMinutesMs(curA, curB, calendar);
    curA = a;
    curB = b;
  }
  if (curB > curA) waitingMinutes += businessMinutesMs(curA, curB, calendar);
  return { customerMinutes, benchMinutes: customerMinutes - waitingMinutes, waitingMinutes };
}

export interface TurnaroundSummary {
  count: number;
  median: number | null;
  p90: number | null;
}

/**
 * Count, median and 90th percentile of turnaround minutes, both quantiles by Hyndman & Fan
 * (1996) type 7. Empty input gives count 0 and null quantiles; NaN values are rejected.
 */
export function turnaroundSummary(minutes: readonly number[]): TurnaroundSummary {
  if (minutes.length === 0) return { count: 0, median: null, p90: null };
  const sorted = Float64Array.from(minutes);
  if (sorted.some(Number.isNaN)) throw new RangeError('turnaround minutes contain NaN');
  sorted.sort();
  return {
    count: sorted.length,
    median: quantileSorted(sorted, 0.5),
    p90: quantileSorted(sorted, 0.9),
  };
}

export interface OnTimeShare {
  onTime: number;
  total: number;
  share: number | null;
}

/**
 * On-time share: of the jobs that are ready and had a promised time, the share ready at or
 * before the promised instant. Jobs with a null readyAt or promisedAt are left out of both
 * counts; no countable job gives share null.
 */
export function onTimeShare(
  jobs: ReadonlyArray<{ readyAt: Date | null; promisedAt: Date | null }>,
): OnTimeShare {
  let onTime = 0;
  let total = 0;
  for (const job of jobs) {
    if (job.readyAt === null || job.promisedAt === null) continue;
    total++;
    if (job.readyAt.getTime() <= job.promisedAt.getTime()) onTime++;
  }
  return { onTime, total, share: total === 0 ? null : onTime / total };
}
