import type { Interval } from './intervals';
import { standardizedRatio, type StandardizedRatio } from './ratio';
import {
  type CumulativeHazard,
  eventProbability,
  expectedEvents,
  kaplanMeier,
  nelsonAalen,
  type SurvivalTable,
  tableTotals,
} from './survival';

/** The network's curve from a reference period whose windows have closed. */
export interface ComebackReference {
  warrantyDays: number;
  /** Nelson–Aalen cumulative hazard over days since collection. */
  hazard: CumulativeHazard;
  /** Kaplan–Meier probability of a counted comeback within the window, 1 − Ŝ(W). */
  probability: number;
}

/**
 * The network reference for standardized ratios from a survival table (jobs of a reference
 * period, for instance the twelve months before): its Nelson–Aalen hazard and its Kaplan–Meier
 * W-day probability. Null when that probability is not reached (no job followed to W).
 */
export function comebackReference(
  table: SurvivalTable,
  warrantyDays: number,
): ComebackReference | null {
  const probability = eventProbability(kaplanMeier(table), warrantyDays).probability;
  if (probability === null) return null;
  return { warrantyDays, hazard: nelsonAalen(table), probability };
}

/**
 * A shop's expected W-day comeback rate from its standardized ratio: SR × the network's W-day
 * probability, capped at 1 (the definition; for small rates it is close to the
 * proportional-hazards form 1 − (1 − p)^SR).
 */
export function expectedRate(ratio: number, networkProbability: number): number {
  if (!(ratio >= 0) || !(networkProbability >= 0 && networkProbability <= 1)) {
    throw new RangeError('ratio must be ≥ 0 and the network probability in [0, 1]');
  }
  return Math.min(1, ratio * networkProbability);
}

export interface ComebackEstimate {
  /**
   * 'kaplan-meier' when the estimate comes from the jobs' own curve; 'network × ratio' when
   * no job has been followed through the window yet and it is the network's W-day probability
   * times the shop's standardized ratio; null when neither can be given.
   */
  method: 'kaplan-meier' | 'network × ratio' | null;
  /** Estimated probability of a counted comeback within the warranty window. */
  probability: number | null;
  /** Greenwood standard error (Kaplan–Meier only). */
  standardError: number | null;
  interval: Interval | null;
  /** No job still being followed (each window closed or ended by a comeback): the estimate is then the final rate events / jobs. */
  final: boolean;
  jobs: number;
  events: number;
  /** Jobs censored before W: still inside their window with no counted comeback. */
  stillFollowed: number;
  /** Jobs followed through the whole window (or with a comeback on its last day). */
  followedThrough: number;
  /** O/E against the reference hazard; null without a reference. */
  ratio: StandardizedRatio | null;
  /** SR × the reference's W-day probability; null without a reference or with E = 0. */
  expectedRate: number | null;
}

/**
 * Probability of a counted comeback within the warranty window W for a shop or the network,
 * from its follow-up table (`followUpTable`, or grouped counts of the same definition).
 *
 * When at least one job has been followed through W, or none is still being followed, it is
 * the Kaplan–Meier estimate 1 − Ŝ(W) with Greenwood's standard error and the log–log 95%
 * interval (`eventProbability`). Otherwise the Kaplan–Meier curve does not reach W and, given a
 * reference, the estimate is the network's W-day probability carried by the shop's ratio,
 * SR × p, with the ratio's exact interval times p (the network's own uncertainty, from a far
 * larger reference, is left out); method says which. Without a reference, or with nothing
 * expected (E = 0), probability and interval are null. No jobs: null, not final.
 */
export function comebackEstimate(
  table: SurvivalTable,
  options: { warrantyDays: number; reference?: ComebackReference | null; confidence?: number },
): ComebackEstimate {
  const w = options.warrantyDays;
  const confidence = options.confidence ?? 0.95;
  const reference = options.reference ?? null;
  if (reference && reference.warrantyDays !== w) {
    throw new RangeError('the reference was built for another warranty window');
  }
  const totals = tableTotals(table, w);
  const ratio = reference
    ? standardizedRatio(totals.events, expectedEvents(table, reference.hazard), confidence)
    : null;
  const carried = ratio?.ratio == null ? null : expectedRate(ratio.ratio, reference!.probability);
  const base = {
    final: totals.jobs > 0 && totals.censoredBefore === 0,
    jobs: totals.jobs,
    events: totals.events,
    stillFollowed: totals.censoredBefore,
    followedThrough: totals.followedThrough,
    ratio,
    expectedRate: carried,
  };
  if (totals.jobs > 0 && (totals.followedThrough > 0 || totals.censoredBefore === 0)) {
    const km = eventProbability(kaplanMeier(table), w, confidence);
    if (km.probability !== null) {
      return {
        method: 'kaplan-meier',
        probability: km.probability,
        standardError: km.standardError,
        interval: km.interval,
        ...base,
      };
    }
  }
  if (carried !== null && ratio?.interval) {
    const p = reference!.probability;
    return {
      method: 'network × ratio',
      probability: carried,
      standardError: null,
      interval: {
        lower: Math.min(1, ratio.interval.lower * p),
        upper: Math.min(1, ratio.interval.upper * p),
      },
      ...base,
    };
  }
  return { method: null, probability: null, standardError: null, interval: null, ...base };
}
