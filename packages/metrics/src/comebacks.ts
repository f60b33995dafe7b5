import { type Interval, wilsonInterval } from './intervals';

/** Comeback attributions, as stored in the database enum. */
export type ComebackAttribution =
  'workmanship' | 'part_failure' | 'customer_damage' | 'unrelated' | 'undetermined';

export const COMEBACK_ATTRIBUTIONS: readonly ComebackAttribution[] = [
  'workmanship',
  'part_failure',
  'customer_damage',
  'unrelated',
  'undetermined',
];

/** Attributions that count against the shop unless the owner's setting says otherwise. */
export const DEFAULT_COUNTED_ATTRIBUTIONS: readonly ComebackAttribution[] = [
  'workmanship',
  'part_failure',
];

export interface ComebackRateJob {
  /** When the customer collected the reel; null if not collected. */
  collectedAt: Date | null;
  /** Comebacks recorded against this job (empty when none). */
  comebacks: ReadonlyArray<{ attribution: ComebackAttribution; reportedAt: Date }>;
}

export interface ComebackRate {
  events: number;
  trials: number;
  rate: number | null;
  interval: Interval | null;
}

const DAY = 86_400_000;

/**
 * Comeback rate (README, figures table). Pass the jobs collected in the period.
 * A job is a trial when it was collected by `asOf` and either its warranty window
 * [collectedAt, collectedAt + warrantyDays × 24 h) has closed by `asOf`, or it already came
 * back (a comeback reported inside the window, by `asOf`, whatever its attribution). It is an
 * event when such a comeback has an attribution in `countedAttributions`; a job that came back
 * twice counts once. Jobs still inside their window with no comeback are censored (left out).
 *
 * rate = events / trials with a 95% Wilson interval; both null when there are no trials
 * (empty input, or every job censored). Comebacks reported after `asOf` or outside the window
 * are ignored. Throws RangeError on a negative warranty.
 */
export function comebackRate(
  jobs: readonly ComebackRateJob[],
  options: {
    asOf: Date;
    warrantyDays: number;
    countedAttributions?: readonly ComebackAttribution[];
  },
): ComebackRate {
  if (!(options.warrantyDays >= 0)) {
    throw new RangeError(`warrantyDays must be non-negative, got ${options.warrantyDays}`);
  }
  const asOf = options.asOf.getTime();
  const windowMs = options.warrantyDays * DAY;
  const counted = new Set(options.countedAttributions ?? DEFAULT_COUNTED_ATTRIBUTIONS);
  let events = 0;
  let trials = 0;
  for (const job of jobs) {
    if (job.collectedAt === null) continue;
    const collected = job.collectedAt.getTime();
    if (collected > asOf) continue;
    const windowEnd = collected + windowMs;
    let cameBack = false;
    let isEvent = false;
    for (const c of job.comebacks) {
      const at = c.reportedAt.getTime();
      if (at < collected || at >= windowEnd || at > asOf) continue;
      cameBack = true;
      if (counted.has(c.attribution)) isEvent = true;
    }
    if (cameBack || windowEnd <= asOf) {
      trials++;
      if (isEvent) events++;
    }
  }
  return {
    events,
    trials,
    rate: trials === 0 ? null : events / trials,
    interval: wilsonInterval(events, trials),
  };
}
