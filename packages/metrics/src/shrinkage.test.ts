import stdlibBetaln from '@stdlib/math-base-special-betaln';
import stdlibGammaln from '@stdlib/math-base-special-gammaln';
import stdlibBetaCdf from '@stdlib/stats-base-dists-beta-cdf';
import stdlibBetaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { betaCdf, betaQuantile, logGamma } from './beta';
import {
  betaBinomialLogLikelihood,
  fitBetaPrior,
  momentsPrior,
  shrinkRates,
  type Counts,
  type ShrunkRate,
} from './shrinkage';

// The 70 historical control groups of the rat tumour example: Tarone (1982), "The use of
// historical control information in testing for a trend in proportions", Biometrics 38:215–220,
// as printed in Gelman et al., "Bayesian Data Analysis" (3rd ed., 2013), Table 5.1. The counts
// are recalled from memory; their summary below matches the book's printed one (mean 0.136,
// standard deviation 0.103), which a wrong count would not.
const RAT_TUMOUR = (
  '0/20 0/20 0/20 0/20 0/20 0/20 0/20 0/19 0/19 0/19 0/19 0/18 0/18 0/17 1/20 1/20 1/20 1/20 ' +
  '1/19 1/19 1/18 1/18 2/25 2/24 2/23 2/20 2/20 2/20 2/20 2/20 2/20 1/10 5/49 2/19 5/46 3/27 ' +
  '2/17 7/49 7/47 3/20 3/20 2/13 9/48 10/50 4/20 4/20 4/20 4/20 4/20 4/20 4/20 10/48 4/19 ' +
  '4/19 4/19 5/22 11/46 12/49 5/20 5/20 6/23 5/19 6/22 6/20 6/20 6/20 16/52 15/47 15/46 9/24'
)
  .split(' ')
  .map((pair) => {
    const [events, trials] = pair.split('/').map(Number) as [number, number];
    return { events, trials };
  });

describe('beta distribution pieces against @stdlib', () => {
  it('log-gamma agrees with @stdlib/math-base-special-gammaln', () => {
    for (const x of [1e-3, 0.1, 0.5, 1, 1.5, 2, 3.7, 10, 52.5, 1000, 1e5]) {
      expect(logGamma(x)).toBeCloseTo(stdlibGammaln(x), 10);
    }
  });

  it('the beta CDF agrees with @stdlib/stats-base-dists-beta-cdf', () => {
    for (const [a, b] of [
      [0.5, 0.5],
      [1.4, 8.6],
      [2, 30],
      [12.3, 80.1],
      [300, 2000],
    ] as const) {
      for (const x of [0.001, 0.05, 0.1, 0.136, 0.3, 0.5, 0.9]) {
        expect(Math.abs(betaCdf(x, a, b) - stdlibBetaCdf(x, a, b))).toBeLessThan(1e-12);
      }
    }
  });

  it('the beta quantile agrees with @stdlib/stats-base-dists-beta-quantile', () => {
    for (const [a, b] of [
      [1.4, 8.6],
      [5.4, 22.6],
      [0.7, 40],
      [120, 900],
    ] as const) {
      for (const p of [0.025, 0.1, 0.5, 0.9, 0.975]) {
        expect(betaQuantile(p, a, b)).toBeCloseTo(stdlibBetaQuantile(p, a, b), 10);
      }
    }
  });

  it('the beta-binomial likelihood agrees with one built from @stdlib betaln and gammaln', () => {
    const groups = RAT_TUMOUR.slice(20, 40);
    const reference = groups.reduce((sum, { events: k, trials: n }) => {
      const choose = stdlibGammaln(n + 1) - stdlibGammaln(k + 1) - stdlibGammaln(n - k + 1);
      return sum + choose + stdlibBetaln(k + 2.3, n - k + 14) - stdlibBetaln(2.3, 14);
    }, 0);
    expect(betaBinomialLogLikelihood(2.3, 14, groups)).toBeCloseTo(reference, 9);
  });
});

describe('empirical-Bayes beta-binomial prior', () => {
  it('method of moments on the rat tumour data gives α = 1.4, β = 8.6 (Gelman et al., BDA3 §5.3)', () => {
    const prior = momentsPrior(RAT_TUMOUR)!;
    expect(prior.alpha).toBeCloseTo(1.4, 1);
    expect(prior.beta).toBeCloseTo(8.6, 1);
  });

  it('maximum likelihood beats the moments start and sits at a maximum', () => {
    const fit = fitBetaPrior(RAT_TUMOUR);
    expect(fit.kind).toBe('fitted');
    if (fit.kind !== 'fitted') return;
    const start = momentsPrior(RAT_TUMOUR)!;
    expect(fit.logLikelihood).toBeGreaterThan(
      betaBinomialLogLikelihood(start.alpha, start.beta, RAT_TUMOUR),
    );
    // No nearby prior is more likely.
    for (const [da, db] of [
      [1.02, 1],
      [0.98, 1],
      [1, 1.02],
      [1, 0.98],
      [1.02, 1.02],
      [0.98, 0.98],
    ] as const) {
      expect(betaBinomialLogLikelihood(fit.alpha * da, fit.beta * db, RAT_TUMOUR)).toBeLessThan(
        fit.logLikelihood + 1e-9,
      );
    }
    // The prior's mean stays near the raw rates' (0.136) and the pooled rate (267/1739).
    expect(fit.mean).toBeGreaterThan(0.12);
    expect(fit.mean).toBeLessThan(0.16);
  });

  it('says why when there is nothing to fit', () => {
    expect(fitBetaPrior([])).toEqual({ kind: 'pooled', mean: null, reason: 'no trials' });
    expect(fitBetaPrior([{ events: 1, trials: 4 }])).toMatchObject({ reason: 'one group' });
    expect(
      fitBetaPrior([
        { events: 0, trials: 30 },
        { events: 0, trials: 4 },
      ]),
    ).toMatchObject({ kind: 'pooled', mean: 0, reason: 'no events' });
    // The same rate everywhere: no spread beyond chance, so the pooled rate.
    const alike: Counts[] = Array.from({ length: 12 }, () => ({ events: 5, trials: 100 }));
    expect(fitBetaPrior(alike)).toEqual({ kind: 'pooled', mean: 0.05, reason: 'no spread' });
    expect(() => fitBetaPrior([{ events: 3, trials: 2 }])).toThrow(RangeError);
  });
});

describe('shrunk per-person rates', () => {
  const fit = fitBetaPrior(RAT_TUMOUR);

  it('pulls small groups toward the prior mean more than large ones', () => {
    const [small, large] = shrinkRates(
      [
        { events: 1, trials: 4 },
        { events: 25, trials: 100 },
      ],
      fit,
      { reference: 0.136, margin: 0.02 },
    );
    if (fit.kind !== 'fitted') throw new Error('expected a fitted prior');
    // Both raw rates are 25%; the posterior means lie between them and the prior mean.
    expect(small!.raw).toBe(0.25);
    expect(small!.estimate!).toBeGreaterThan(fit.mean);
    expect(small!.estimate!).toBeLessThan(large!.estimate!);
    expect(large!.estimate!).toBeLessThan(0.25);
    // The posterior mean is (α + k) / (α + β + n).
    expect(small!.estimate!).toBeCloseTo((fit.alpha + 1) / (fit.alpha + fit.beta + 4), 12);
    // The large group's evidence is stronger: a narrower interval, a higher chance of being above.
    const width = (r: ShrunkRate['interval']) => r!.upper - r!.lower;
    expect(width(large!.interval)).toBeLessThan(width(small!.interval));
    expect(large!.probabilityAbove!).toBeGreaterThan(small!.probabilityAbove!);
    expect(large!.band).toBe('coach now');
    expect(small!.band).toBe('in line');
  });

  it('gives a person with no jobs the prior itself, and the interval its quantiles', () => {
    if (fit.kind !== 'fitted') throw new Error('expected a fitted prior');
    const [none] = shrinkRates([{ events: 0, trials: 0 }], fit, { reference: 0.136, margin: 0.02 });
    expect(none!.raw).toBeNull();
    expect(none!.estimate).toBeCloseTo(fit.mean, 12);
    expect(none!.interval!.lower).toBeCloseTo(stdlibBetaQuantile(0.025, fit.alpha, fit.beta), 10);
    expect(none!.interval!.upper).toBeCloseTo(stdlibBetaQuantile(0.975, fit.alpha, fit.beta), 10);
  });

  it('with a pooled fit reads the pooled rate for everyone, in line', () => {
    const pooled = fitBetaPrior([
      { events: 2, trials: 40 },
      { events: 2, trials: 40 },
    ]);
    expect(pooled.kind).toBe('pooled');
    const rows = shrinkRates([{ events: 2, trials: 40 }], pooled, { reference: 0.05, margin: 0 });
    expect(rows[0]).toMatchObject({ estimate: 0.05, interval: null, band: 'in line' });
  });
});

describe('shrinkage properties', () => {
  const prior = fc.record({
    alpha: fc.double({ min: 0.05, max: 200, noNaN: true }),
    beta: fc.double({ min: 0.05, max: 2000, noNaN: true }),
  });
  const counts = fc
    .integer({ min: 1, max: 500 })
    .chain((trials) =>
      fc.record({ trials: fc.constant(trials), events: fc.integer({ min: 0, max: trials }) }),
    );
  const fitted = (p: { alpha: number; beta: number }) =>
    ({ kind: 'fitted', ...p, mean: p.alpha / (p.alpha + p.beta), logLikelihood: 0 }) as const;

  it('the estimate always lies between the raw rate and the prior mean', () => {
    fc.assert(
      fc.property(prior, counts, (p, c) => {
        const [r] = shrinkRates([c], fitted(p), { reference: 0.1, margin: 0 });
        const lo = Math.min(r!.raw!, p.alpha / (p.alpha + p.beta));
        const hi = Math.max(r!.raw!, p.alpha / (p.alpha + p.beta));
        return r!.estimate! >= lo - 1e-12 && r!.estimate! <= hi + 1e-12;
      }),
    );
  });

  it('more jobs at the same raw rate shrink less', () => {
    fc.assert(
      fc.property(prior, counts, fc.integer({ min: 2, max: 20 }), (p, c, times) => {
        const [one, many] = shrinkRates(
          [c, { events: c.events * times, trials: c.trials * times }],
          fitted(p),
          { reference: 0.1, margin: 0 },
        );
        const mean = p.alpha / (p.alpha + p.beta);
        return (
          Math.abs(many!.estimate! - one!.raw!) <= Math.abs(one!.estimate! - one!.raw!) + 1e-12 &&
          Math.abs(many!.estimate! - mean) >= Math.abs(one!.estimate! - mean) - 1e-12
        );
      }),
    );
  });

  it('the credible interval holds the estimate', () => {
    fc.assert(
      fc.property(prior, counts, (p, c) => {
        const [r] = shrinkRates([c], fitted(p), { reference: 0.1, margin: 0 });
        return r!.interval!.lower <= r!.estimate! && r!.estimate! <= r!.interval!.upper;
      }),
      { numRuns: 200 },
    );
  });
});
