import { normalQuantile } from './normal';

// Binomial probabilities after Loader (2000) "Fast and accurate computation of binomial
// probabilities" (the saddle-point form R's dbinom uses): accurate for n in the millions,
// where a product of factorials would overflow and log-gamma differences lose digits.

const LN_2PI = Math.log(2 * Math.PI);
const HALF_LN_2PI = 0.5 * LN_2PI;

const smallStirling: number[] = (() => {
  // stirlerr(n) = ln n! − (n + ½) ln n + n − ½ ln 2π, exact enough from a sum of logs for n ≤ 15.
  const out = [0];
  let lnFactorial = 0;
  for (let n = 1; n <= 15; n++) {
    lnFactorial += Math.log(n);
    out.push(lnFactorial - (n + 0.5) * Math.log(n) + n - HALF_LN_2PI);
  }
  return out;
})();

/** Error of Stirling's approximation to ln n!, for integer n ≥ 0. */
export function stirlerr(n: number): number {
  if (n <= 15) return smallStirling[n]!;
  const nn = n * n;
  const S0 = 1 / 12;
  const S1 = 1 / 360;
  const S2 = 1 / 1260;
  const S3 = 1 / 1680;
  const S4 = 1 / 1188;
  if (n > 500) return (S0 - S1 / nn) / n;
  if (n > 80) return (S0 - (S1 - S2 / nn) / nn) / n;
  if (n > 35) return (S0 - (S1 - (S2 - S3 / nn) / nn) / nn) / n;
  return (S0 - (S1 - (S2 - (S3 - S4 / nn) / nn) / nn) / nn) / n;
}

/** Deviance term x ln(x / np) + np − x, computed without cancellation near x = np. */
export function bd0(x: number, np: number): number {
  if (Math.abs(x - np) < 0.1 * (x + np)) {
    let v = (x - np) / (x + np);
    let s = (x - np) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const s1 = s + ej / (2 * j + 1);
      if (s1 === s) return s1;
      s = s1;
    }
    return s;
  }
  return x * Math.log(x / np) + np - x;
}

function checkArgs(n: number, p: number): void {
  if (!Number.isInteger(n) || n < 0)
    throw new RangeError(`trials must be a non-negative integer, got ${n}`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`probability must be in [0, 1], got ${p}`);
}

/** P(X = k) for X ~ Binomial(n, p). */
export function binomialPmf(k: number, n: number, p: number): number {
  checkArgs(n, p);
  if (!Number.isInteger(k) || k < 0 || k > n) return 0;
  return pmf(k, n, p);
}

function pmf(x: number, n: number, p: number): number {
  const q = 1 - p;
  if (p === 0) return x === 0 ? 1 : 0;
  if (q === 0) return x === n ? 1 : 0;
  if (x === 0) {
    if (n === 0) return 1;
    return Math.exp(p < 0.1 ? -bd0(n, n * q) - n * p : n * Math.log(q));
  }
  if (x === n) return Math.exp(q < 0.1 ? -bd0(n, n * p) - n * q : n * Math.log(p));
  const lc = stirlerr(n) - stirlerr(x) - stirlerr(n - x) - bd0(x, n * p) - bd0(n - x, n * q);
  const lf = LN_2PI + Math.log(x) + Math.log1p(-x / n);
  return Math.exp(lc - 0.5 * lf);
}

const TINY = 1e-17;

/** Σ P(X = j) for j ≤ k, summed downward from k; only accurate while k is at or below the mode. */
function lowerSum(k: number, n: number, p: number): number {
  let term = pmf(k, n, p);
  let sum = term;
  const ratio = (1 - p) / p;
  for (let j = k; j > 0 && term > sum * TINY; j--) {
    term *= (j / (n - j + 1)) * ratio;
    sum += term;
  }
  return sum;
}

/** Σ P(X = j) for j > k, summed upward; only accurate while k is at or above the mode. */
function upperSum(k: number, n: number, p: number): number {
  if (k >= n) return 0;
  let term = pmf(k + 1, n, p);
  let sum = term;
  const ratio = p / (1 - p);
  for (let j = k + 1; j < n && term > sum * TINY; j++) {
    term *= ((n - j) / (j + 1)) * ratio;
    sum += term;
  }
  return sum;
}

/** [P(X ≤ k), P(X > k)], the smaller of the two summed directly. */
function tails(k: number, n: number, p: number): [number, number] {
  if (k < 0) return [0, 1];
  if (k >= n) return [1, 0];
  if (p === 0) return [1, 0];
  if (p === 1) return [0, 1];
  if (k < n * p) {
    const lower = lowerSum(k, n, p);
    return [lower, 1 - lower];
  }
  const upper = upperSum(k, n, p);
  return [1 - upper, upper];
}

/** P(X ≤ k) for X ~ Binomial(n, p); k is floored. */
export function binomialCdf(k: number, n: number, p: number): number {
  checkArgs(n, p);
  return tails(Math.floor(k), n, p)[0];
}

/** P(X > k) for X ~ Binomial(n, p), computed without 1 − cdf cancellation in the upper tail. */
export function binomialSurvival(k: number, n: number, p: number): number {
  checkArgs(n, p);
  return tails(Math.floor(k), n, p)[1];
}

/**
 * Binomial quantile: the smallest integer k with P(X ≤ k) ≥ q. Starts from the
 * Cornish–Fisher approximation and steps with exact CDF values, so it is fast for n up to
 * millions. q = 0 gives 0; q = 1 gives n (or 0 when p = 0).
 */
export function binomialQuantile(q: number, n: number, p: number): number {
  checkArgs(n, p);
  if (!(q >= 0 && q <= 1)) throw new RangeError(`quantile probability must be in [0, 1], got ${q}`);
  if (q === 0 || p === 0 || n === 0) return 0;
  if (q === 1 || p === 1) return n;
  const mu = n * p;
  const sigma = Math.sqrt(mu * (1 - p));
  const z = normalQuantile(q);
  const gamma = (1 - 2 * p) / sigma;
  let k = Math.floor(mu + sigma * (z + (gamma * (z * z - 1)) / 6) + 0.5);
  k = Math.min(n, Math.max(0, k));
  if (tails(k, n, p)[0] >= q) {
    while (k > 0 && tails(k - 1, n, p)[0] >= q) k--;
  } else {
    do k++;
    while (k < n && tails(k, n, p)[0] < q);
  }
  return k;
}
