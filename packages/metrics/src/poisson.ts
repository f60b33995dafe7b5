import { bd0, stirlerr } from './binomial';
import type { Interval } from './intervals';
import { normalQuantile } from './normal';

// Poisson probabilities in Loader's (2000) saddle-point form, as R's dpois: exact enough for
// means in the millions, where e^−μ μ^k / k! would underflow or overflow.

const TWO_PI = 2 * Math.PI;
const TINY = 1e-17;

function checkMean(mean: number): void {
  if (!(mean >= 0) || !Number.isFinite(mean)) {
    throw new RangeError(`mean must be a finite non-negative number, got ${mean}`);
  }
}

function pmf(k: number, mean: number): number {
  if (mean === 0) return k === 0 ? 1 : 0;
  if (k === 0) return Math.exp(-mean);
  return Math.exp(-stirlerr(k) - bd0(k, mean)) / Math.sqrt(TWO_PI * k);
}

/** P(X = k) for X ~ Poisson(mean); 0 for k that is negative or not an integer. */
export function poissonPmf(k: number, mean: number): number {
  checkMean(mean);
  if (!Number.isInteger(k) || k < 0) return 0;
  return pmf(k, mean);
}

/** [P(X ≤ k), P(X > k)], the smaller tail summed directly by the pmf recurrence. */
function tails(k: number, mean: number): [number, number] {
  if (k < 0) return [0, 1];
  if (mean === 0) return [1, 0];
  if (k < mean) {
    let term = pmf(k, mean);
    let sum = term;
    for (let j = k; j > 0 && term > sum * TINY; j--) {
      term *= j / mean;
      sum += term;
    }
    return [sum, 1 - sum];
  }
  let term = pmf(k + 1, mean);
  let sum = term;
  for (let j = k + 1; term > sum * TINY; j++) {
    term *= mean / (j + 1);
    sum += term;
  }
  return [1 - sum, sum];
}

/** P(X ≤ k) for X ~ Poisson(mean); k is floored. */
export function poissonCdf(k: number, mean: number): number {
  checkMean(mean);
  return tails(Math.floor(k), mean)[0];
}

/** P(X > k) for X ~ Poisson(mean), without 1 − cdf cancellation in the upper tail. */
export function poissonSurvival(k: number, mean: number): number {
  checkMean(mean);
  return tails(Math.floor(k), mean)[1];
}

/**
 * Poisson quantile: the smallest integer k with P(X ≤ k) ≥ q, from a Cornish–Fisher start
 * stepped with exact CDF values. q = 0 or a mean of 0 gives 0; q = 1 gives Infinity.
 */
export function poissonQuantile(q: number, mean: number): number {
  checkMean(mean);
  if (!(q >= 0 && q <= 1)) throw new RangeError(`quantile probability must be in [0, 1], got ${q}`);
  if (q === 0 || mean === 0) return 0;
  if (q === 1) return Infinity;
  const sigma = Math.sqrt(mean);
  const z = normalQuantile(q);
  let k = Math.max(0, Math.floor(mean + sigma * (z + (z * z - 1) / (6 * sigma)) + 0.5));
  if (tails(k, mean)[0] >= q) {
    while (k > 0 && tails(k - 1, mean)[0] >= q) k--;
  } else {
    do k++;
    while (tails(k, mean)[0] < q);
  }
  return k;
}

/**
 * Root of an increasing f on [0, ∞) with f(0) < 0: Newton steps with f′ from a starting guess,
 * kept inside a bracket that bisection narrows whenever a step would leave it.
 */
function rootIncreasing(f: (mu: number) => number, slope: (mu: number) => number, start: number) {
  let lo = 0;
  let hi = Infinity;
  let mu = Math.max(start, Number.MIN_VALUE);
  for (let i = 0; i < 200; i++) {
    const value = f(mu);
    if (value === 0) return mu;
    if (value < 0) lo = mu;
    else hi = mu;
    const d = slope(mu);
    const step = d > 0 ? value / d : NaN;
    if (Math.abs(step) <= 1e-14 * mu) return mu - step;
    let next = mu - step;
    if (!(next > lo && next < hi)) next = hi === Infinity ? Math.max(2 * mu, 1) : (lo + hi) / 2;
    if (hi < Infinity && hi - lo <= 1e-15 * hi) return next;
    mu = next;
  }
  return mu;
}

/**
 * Exact ("Garwood") confidence interval for a Poisson mean from an observed count: Garwood
 * (1936) "Fiducial limits for the Poisson distribution", Biometrika 28:437–442. The lower
 * limit is the mean μ with P(X ≥ observed | μ) = α/2 (0 when observed = 0), the upper the μ with
 * P(X ≤ observed | μ) = α/2; equivalently χ²(α/2; 2x)/2 and χ²(1 − α/2; 2x + 2)/2, or gamma
 * quantiles Γ⁻¹(α/2; x) and Γ⁻¹(1 − α/2; x + 1). Solved by safeguarded Newton steps on this
 * module's tails.
 *
 * Throws RangeError on a count that is not a non-negative integer or a confidence outside (0, 1).
 */
export function poissonInterval(observed: number, confidence = 0.95): Interval {
  if (!Number.isInteger(observed) || observed < 0) {
    throw new RangeError(`observed must be a non-negative integer, got ${observed}`);
  }
  if (!(confidence > 0 && confidence < 1)) {
    throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  }
  const tail = (1 - confidence) / 2;
  const x = observed;
  const z = normalQuantile(1 - tail);
  // Wilson–Hilferty starts; d/dμ P(X ≤ k | μ) = −P(X = k | μ) gives the Newton slopes.
  const wh = (k: number, zz: number) => k * (1 - 1 / (9 * k) + zz / (3 * Math.sqrt(k))) ** 3;
  const lower =
    x === 0
      ? 0
      : rootIncreasing(
          (mu) => tails(x - 1, mu)[1] - tail,
          (mu) => pmf(x - 1, mu),
          Math.max(wh(x, -z), x / 100),
        );
  const upper = rootIncreasing(
    (mu) => tail - tails(x, mu)[0],
    (mu) => pmf(x, mu),
    wh(x + 1, z),
  );
  return { lower, upper };
}
