import type { FairnessBand } from './funnel';
import type { Interval } from './intervals';
import { poissonCdf, poissonInterval, poissonQuantile, poissonSurvival } from './poisson';

export interface StandardizedRatio {
  observed: number;
  expected: number;
  /** O/E; null when nothing was expected (E = 0). */
  ratio: number | null;
  /** Exact Poisson (Garwood) interval for O, divided by E; null when E = 0. */
  interval: Interval | null;
}

function checkObserved(observed: number): void {
  if (!Number.isInteger(observed) || observed < 0) {
    throw new RangeError(`observed must be a non-negative integer, got ${observed}`);
  }
}

function checkExpected(expected: number): void {
  if (!(expected >= 0) || !Number.isFinite(expected)) {
    throw new RangeError(`expected must be a finite non-negative number, got ${expected}`);
  }
}

/**
 * Indirectly standardized ratio SR = O/E (observed over expected events), with the exact
 * Poisson interval for O (Garwood 1936, `poissonInterval`) divided by E, E taken as known
 * (Breslow & Day (1987), "Statistical Methods in Cancer Research" vol. II, §2.3). E = 0 gives
 * null ratio and interval. Throws RangeError on a non-integer O or a negative E.
 */
export function standardizedRatio(
  observed: number,
  expected: number,
  confidence = 0.95,
): StandardizedRatio {
  checkObserved(observed);
  checkExpected(expected);
  if (expected === 0) return { observed, expected, ratio: null, interval: null };
  const counts = poissonInterval(observed, confidence);
  return {
    observed,
    expected,
    ratio: observed / expected,
    interval: { lower: counts.lower / expected, upper: counts.upper / expected },
  };
}

/** Spiegelhalter's interpolated Poisson limit at probability q, as a count. */
function interpolatedCount(q: number, mean: number): number {
  const r = poissonQuantile(q, mean);
  const atR = poissonCdf(r, mean);
  const belowR = r > 0 ? poissonCdf(r - 1, mean) : 0;
  const alpha = atR > belowR ? (atR - q) / (atR - belowR) : 0;
  return r - alpha;
}

/**
 * Funnel-plot limits for an indirectly standardized ratio O/E against E: Spiegelhalter (2005)
 * "Funnel plots for comparing institutional performance", Statistics in Medicine
 * 24:1185–1202 (target ratio 1, precision E; exact limits with interpolation, appendix A.1,
 * Poisson case): O ~ Poisson(E), r_p the smallest r with P(O ≤ r) ≥ p,
 * α = (P(O ≤ r_p) − p) / (P(O ≤ r_p) − P(O ≤ r_p − 1)), limit (r_p − α) / E, at
 * p = (1 − coverage)/2 and (1 + coverage)/2. Both limits are at least 0; with E well below 1
 * the interpolated upper limit can fall below 1, as the formula implies (`ratioBand` guards).
 *
 * Null when E = 0 (no funnel). Throws RangeError on a negative E or coverage outside (0, 1).
 */
export function ratioFunnelLimits(expected: number, coverage: number): Interval | null {
  checkExpected(expected);
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must be in (0, 1), got ${coverage}`);
  }
  if (expected === 0) return null;
  const tail = (1 - coverage) / 2;
  return {
    lower: Math.max(0, interpolatedCount(tail, expected) / expected),
    upper: Math.max(0, interpolatedCount(1 - tail, expected) / expected),
  };
}

/** Why a ratio is "in line" although it may lie outside a funnel line, or cannot be judged. */
export type RatioNote = 'nothing expected' | 'too little follow-up' | 'within its own uncertainty';

export interface RatioBand {
  band: FairnessBand;
  /** Which way a shop on watch or out of line lies; null when in line. */
  side: 'high' | 'low' | null;
  note: RatioNote | null;
}

/** Default smallest E at which a ratio is judged at all (Reelwright's rule, not a published one). */
export const DEFAULT_MIN_EXPECTED = 1;

/**
 * Fairness band of a standardized ratio O/E on the Spiegelhalter (2005) Poisson funnel, as
 * `fairnessBand` does for rates: outside the 99.8% limits "out of line", else outside the 95%
 * limits "on watch" (high or low), else "in line". A band is given only when the ratio's own
 * exact interval at that level excludes 1 (P(O' ≥ O | E) or P(O' ≤ O | E) below the tail):
 * the interpolated limits lie inside the integer counts, so with few expected events a single
 * comeback could otherwise cross a line that its own uncertainty does not support; such a
 * shop is "in line" with the note "within its own uncertainty". E below `minExpected`
 * (default 1) is "in line" with "too little follow-up", E = 0 with "nothing expected".
 */
export function ratioBand(
  observed: number,
  expected: number,
  options: { minExpected?: number } = {},
): RatioBand {
  checkObserved(observed);
  checkExpected(expected);
  return bandOn(observed, expected, options.minExpected, (coverage) =>
    ratioFunnelLimits(expected, coverage),
  );
}

function bandOn(
  observed: number,
  expected: number,
  minExpected = DEFAULT_MIN_EXPECTED,
  limitsAt: (coverage: 0.998 | 0.95) => Interval | null,
): RatioBand {
  if (expected === 0) return { band: 'in line', side: null, note: 'nothing expected' };
  if (expected < minExpected) return { band: 'in line', side: null, note: 'too little follow-up' };
  const ratio = observed / expected;
  let crossed = false;
  for (const [coverage, band] of [
    [0.998, 'out of line'],
    [0.95, 'on watch'],
  ] as const) {
    const limits = limitsAt(coverage)!;
    const tail = (1 - coverage) / 2;
    if (ratio > limits.upper) {
      crossed = true;
      if (poissonSurvival(observed - 1, expected) < tail) return { band, side: 'high', note: null };
    } else if (ratio < limits.lower) {
      crossed = true;
      if (poissonCdf(observed, expected) < tail) return { band, side: 'low', note: null };
    }
  }
  return { band: 'in line', side: null, note: crossed ? 'within its own uncertainty' : null };
}

export interface RatioShop {
  shopId: string;
  observed: number;
  expected: number;
}

export interface RatioComparison extends StandardizedRatio, RatioBand {
  shopId: string;
  funnel95: Interval | null;
  funnel998: Interval | null;
}

/**
 * Each shop's standardized ratio O/E with its 95% exact interval, the 95% and 99.8% funnel
 * limits at its own E and its band (`ratioBand`). The target is 1: E already carries the
 * network's hazard over each shop's own follow-up. Shops keep their input order.
 */
export function compareRatios(
  shops: readonly RatioShop[],
  options: { minExpected?: number } = {},
): RatioComparison[] {
  return shops.map((s) => {
    const ratio = standardizedRatio(s.observed, s.expected);
    const funnel95 = ratioFunnelLimits(s.expected, 0.95);
    const funnel998 = ratioFunnelLimits(s.expected, 0.998);
    const band = bandOn(s.observed, s.expected, options.minExpected, (coverage) =>
      coverage === 0.95 ? funnel95 : funnel998,
    );
    return { shopId: s.shopId, ...ratio, funnel95, funnel998, ...band };
  });
}
