import { betaCdf, betaQuantile, logBeta, logGamma } from './beta';
import type { Interval } from './intervals';

// Fair per-person rates: an empirical-Bayes beta-binomial model. Each person's true rate is
// drawn from a Beta(α, β) prior fitted to everyone's counts; a person's estimate is the
// posterior Beta(α + events, β + trials − events), so a handful of jobs moves it only a little
// from the group's rate and many jobs move it a lot (Efron & Morris 1975; Casella (1985) "An
// introduction to empirical Bayes data analysis", The American Statistician 39:83–87).

export interface Counts {
  events: number;
  trials: number;
}

export type PriorFit =
  | {
      kind: 'fitted';
      alpha: number;
      beta: number;
      /** α / (α + β): the rate the estimates are shrunk toward. */
      mean: number;
      logLikelihood: number;
    }
  | {
      /** No prior could be fitted: every estimate is the pooled rate. */
      kind: 'pooled';
      mean: number | null;
      reason: 'no trials' | 'one group' | 'no spread' | 'no events' | 'all events';
    };

function checkCounts({ events, trials }: Counts): void {
  if (!Number.isInteger(trials) || trials < 0) {
    throw new RangeError(`trials must be a non-negative integer, got ${trials}`);
  }
  if (!Number.isInteger(events) || events < 0 || events > trials) {
    throw new RangeError(`events must be an integer in 0…trials, got ${events} of ${trials}`);
  }
}

/** ln C(n, k). */
const logChoose = (n: number, k: number) => logGamma(n + 1) - logGamma(k + 1) - logGamma(n - k + 1);

/**
 * The beta-binomial log-likelihood of the groups' counts under Beta(α, β):
 * Σ ln C(n, k) + ln B(k + α, n − k + β) − ln B(α, β). Groups with no trials add nothing.
 */
export function betaBinomialLogLikelihood(alpha: number, beta: number, groups: Counts[]): number {
  if (!(alpha > 0) || !(beta > 0)) throw new RangeError('alpha and beta must be > 0');
  let sum = 0;
  const prior = logBeta(alpha, beta);
  for (const g of groups) {
    checkCounts(g);
    if (g.trials === 0) continue;
    sum +=
      logChoose(g.trials, g.events) + logBeta(g.events + alpha, g.trials - g.events + beta) - prior;
  }
  return sum;
}

/**
 * Method-of-moments start: the mean m and the sample variance s² of the groups' raw rates, then
 * α + β = m(1 − m)/s² − 1 (Gelman et al., "Bayesian Data Analysis", 3rd ed., §5.3). Null when
 * the rates do not spread (s² = 0) or spread less than that formula allows.
 */
export function momentsPrior(groups: Counts[]): { alpha: number; beta: number } | null {
  const rates = groups.filter((g) => g.trials > 0).map((g) => g.events / g.trials);
  if (rates.length < 2) return null;
  const m = rates.reduce((s, r) => s + r, 0) / rates.length;
  const s2 = rates.reduce((s, r) => s + (r - m) ** 2, 0) / (rates.length - 1);
  if (!(s2 > 0) || m <= 0 || m >= 1) return null;
  const total = (m * (1 - m)) / s2 - 1;
  if (!(total > 0)) return null;
  return { alpha: m * total, beta: (1 - m) * total };
}

/** Nelder–Mead minimisation in two dimensions (Nelder & Mead 1965, standard coefficients). */
function nelderMead(f: (x: [number, number]) => number, start: [number, number], step = 0.5) {
  let simplex: { x: [number, number]; v: number }[] = [
    start,
    [start[0] + step, start[1]],
    [start[0], start[1] + step],
  ].map((x) => ({ x: x as [number, number], v: f(x as [number, number]) }));
  for (let i = 0; i < 2000; i++) {
    simplex.sort((a, b) => a.v - b.v);
    const [best, mid, worst] = simplex as [
      (typeof simplex)[0],
      (typeof simplex)[0],
      (typeof simplex)[0],
    ];
    if (
      Math.abs(worst.v - best.v) < 1e-12 &&
      Math.hypot(worst.x[0] - best.x[0], worst.x[1] - best.x[1]) < 1e-9
    )
      break;
    const c: [number, number] = [(best.x[0] + mid.x[0]) / 2, (best.x[1] + mid.x[1]) / 2];
    const at = (t: number): [number, number] => [
      c[0] + t * (worst.x[0] - c[0]),
      c[1] + t * (worst.x[1] - c[1]),
    ];
    const r = { x: at(-1), v: 0 };
    r.v = f(r.x);
    if (r.v < best.v) {
      const e = { x: at(-2), v: 0 };
      e.v = f(e.x);
      simplex = [best, mid, e.v < r.v ? e : r];
    } else if (r.v < mid.v) {
      simplex = [best, mid, r];
    } else {
      const k = { x: at(r.v < worst.v ? -0.5 : 0.5), v: 0 };
      k.v = f(k.x);
      if (k.v < Math.min(r.v, worst.v)) simplex = [best, mid, k];
      else {
        simplex = simplex.map((p, j) => {
          if (j === 0) return p;
          const x: [number, number] = [(p.x[0] + best.x[0]) / 2, (p.x[1] + best.x[1]) / 2];
          return { x, v: f(x) };
        });
      }
    }
  }
  simplex.sort((a, b) => a.v - b.v);
  return simplex[0]!;
}

/** Past this prior strength (α + β) the groups are as alike as binomial noise: no spread. */
const NO_SPREAD_STRENGTH = 1e5;

/**
 * The prior Beta(α, β) by maximum likelihood of the beta-binomial, searched over the mean's
 * logit and the strength's logarithm, from the method-of-moments start. Falls back to the
 * pooled rate, and says why, when there is nothing to fit: no trials, one group, no events or
 * only events, or no spread between the groups beyond chance (the likelihood keeps rising as
 * the prior hardens toward the pooled rate).
 */
export function fitBetaPrior(groups: Counts[]): PriorFit {
  groups.forEach(checkCounts);
  const used = groups.filter((g) => g.trials > 0);
  const trials = used.reduce((s, g) => s + g.trials, 0);
  const events = used.reduce((s, g) => s + g.events, 0);
  if (trials === 0) return { kind: 'pooled', mean: null, reason: 'no trials' };
  const pooled = events / trials;
  if (used.length < 2) return { kind: 'pooled', mean: pooled, reason: 'one group' };
  if (events === 0) return { kind: 'pooled', mean: 0, reason: 'no events' };
  if (events === trials) return { kind: 'pooled', mean: 1, reason: 'all events' };

  const start = momentsPrior(used) ?? { alpha: pooled * 100, beta: (1 - pooled) * 100 };
  const logit = (p: number) => Math.log(p / (1 - p));
  const negLogLik = ([u, s]: [number, number]) => {
    const mean = 1 / (1 + Math.exp(-u));
    const strength = Math.exp(s);
    const a = mean * strength;
    const b = (1 - mean) * strength;
    if (!(a > 0) || !(b > 0) || !Number.isFinite(strength)) return Number.POSITIVE_INFINITY;
    return -betaBinomialLogLikelihood(a, b, used);
  };
  const best = nelderMead(negLogLik, [
    logit(start.alpha / (start.alpha + start.beta)),
    Math.log(start.alpha + start.beta),
  ]);
  const strength = Math.exp(best.x[1]);
  if (strength > NO_SPREAD_STRENGTH) return { kind: 'pooled', mean: pooled, reason: 'no spread' };
  const mean = 1 / (1 + Math.exp(-best.x[0]));
  return {
    kind: 'fitted',
    alpha: mean * strength,
    beta: (1 - mean) * strength,
    mean,
    logLikelihood: -best.v,
  };
}

export type ShrinkBand = 'in line' | 'worth a look' | 'coach now';

export interface ShrunkRate {
  events: number;
  trials: number;
  /** events / trials; null with no trials. */
  raw: number | null;
  /** The posterior mean (the pooled rate when no prior could be fitted). */
  estimate: number | null;
  /** 95% equal-tailed credible interval from the posterior beta; null when pooled. */
  interval: Interval | null;
  /** Posterior probability that the rate exceeds the reference by more than the margin. */
  probabilityAbove: number | null;
  band: ShrinkBand;
}

export interface ShrinkOptions {
  /** The rate a person is compared with (the shop's or the network's). */
  reference: number;
  /** How far above the reference counts (absolute, e.g. 0.02 for two points). */
  margin: number;
  /** Posterior probabilities for "worth a look" and "coach now". */
  thresholds?: { look: number; coach: number };
  confidence?: number;
}

/**
 * Each group's shrunk rate under the fitted prior (`fitBetaPrior`), its credible interval, the
 * posterior probability that its rate is above reference + margin, and a band from it. With a
 * pooled fit every estimate is the pooled rate and every band "in line". A group with no trials
 * gets the prior itself: no evidence either way.
 */
export function shrinkRates(groups: Counts[], fit: PriorFit, options: ShrinkOptions): ShrunkRate[] {
  const { look, coach } = options.thresholds ?? { look: 0.75, coach: 0.95 };
  const tail = (1 - (options.confidence ?? 0.95)) / 2;
  const cut = options.reference + options.margin;
  return groups.map((g) => {
    checkCounts(g);
    const raw = g.trials > 0 ? g.events / g.trials : null;
    if (fit.kind === 'pooled') {
      return {
        ...g,
        raw,
        estimate: fit.mean,
        interval: null,
        probabilityAbove: null,
        band: 'in line',
      };
    }
    const a = fit.alpha + g.events;
    const b = fit.beta + g.trials - g.events;
    const probabilityAbove = cut >= 1 ? 0 : cut <= 0 ? 1 : 1 - betaCdf(cut, a, b);
    const band: ShrinkBand =
      probabilityAbove >= coach
        ? 'coach now'
        : probabilityAbove >= look
          ? 'worth a look'
          : 'in line';
    return {
      ...g,
      raw,
      estimate: a / (a + b),
      interval: { lower: betaQuantile(tail, a, b), upper: betaQuantile(1 - tail, a, b) },
      probabilityAbove,
      band,
    };
  });
}
