import { binomialCdf, binomialSurvival } from './binomial';
import { normalQuantile } from './normal';

export interface Interval {
  lower: number;
  upper: number;
}

function checkCounts(successes: number, trials: number, confidence: number): void {
  if (!Number.isInteger(trials) || trials < 0) {
    throw new RangeError(`trials must be a non-negative integer, got ${trials}`);
  }
  if (!Number.isInteger(successes) || successes < 0 || successes > trials) {
    throw new RangeError(`successes must be an integer in [0, trials], got ${successes}`);
  }
  if (!(confidence > 0 && confidence < 1)) {
    throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  }
}

const clamp01 = (x: number): number => Math.min(1, Math.max(0, x));

/**
 * Wilson score interval for a binomial proportion: Wilson (1927) "Probable inference, the law
 * of succession, and statistical inference", JASA 22:209–212; method 3 of Newcombe (1998),
 * Statistics in Medicine 17:857–872. With p̂ = x/n and z = Φ⁻¹(1 − α/2):
 * (p̂ + z²/2n ± z√(p̂(1 − p̂)/n + z²/4n²)) / (1 + z²/n), without continuity correction.
 *
 * Returns null when trials = 0; bounds are clamped to [0, 1] (exactly 0 at x = 0 and 1 at
 * x = n). Throws RangeError on non-integer counts, x > n, or confidence outside (0, 1).
 */
export function wilsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): Interval | null {
  checkCounts(successes, trials, confidence);
  if (trials === 0) return null;
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const n = trials;
  const p = successes / n;
  const z2 = z * z;
  const centre = p + z2 / (2 * n);
  const half = z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  const denom = 1 + z2 / n;
  return {
    lower: successes === 0 ? 0 : clamp01((centre - half) / denom),
    upper: successes === trials ? 1 : clamp01((centre + half) / denom),
  };
}

/** Root of a decreasing function f on [0, 1] with f(lo) ≥ 0 ≥ f(hi), to full double precision. */
function bisectDecreasing(f: (p: number) => number): number {
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid <= lo || mid >= hi) break;
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/**
 * Clopper–Pearson "exact" interval: Clopper & Pearson (1934) "The use of confidence or
 * fiducial limits illustrated in the case of the binomial", Biometrika 26:404–413. The lower
 * bound is the p with P(X ≥ x | p) = α/2 (0 when x = 0), the upper the p with
 * P(X ≤ x | p) = α/2 (1 when x = n); equivalently beta quantiles B(α/2; x, n − x + 1) and
 * B(1 − α/2; x + 1, n − x). Solved by bisection on this package's binomial tails.
 *
 * Returns null when trials = 0; same argument checks as wilsonInterval.
 */
export function clopperPearsonInterval(
  successes: number,
  trials: number,
  confidence = 0.95,
): Interval | null {
  checkCounts(successes, trials, confidence);
  if (trials === 0) return null;
  const tail = (1 - confidence) / 2;
  const x = successes;
  const n = trials;
  const lower = x === 0 ? 0 : bisectDecreasing((p) => tail - binomialSurvival(x - 1, n, p));
  const upper = x === n ? 1 : bisectDecreasing((p) => binomialCdf(x, n, p) - tail);
  return { lower, upper };
}
