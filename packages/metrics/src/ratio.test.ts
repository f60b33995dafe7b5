import stdlibChisquareQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import stdlibGammaQuantile from '@stdlib/stats-base-dists-gamma-quantile';
import stdlibNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdlibPoissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import stdlibPoissonQuantile from '@stdlib/stats-base-dists-poisson-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  poissonCdf,
  poissonInterval,
  poissonPmf,
  poissonQuantile,
  poissonSurvival,
} from './poisson';
import { compareRatios, ratioBand, ratioFunnelLimits, standardizedRatio } from './ratio';

// @stdlib's Poisson CDF and chi-square quantile are accurate in the bulk but drift in far tails
// at large means (0.9% at P(X ≤ 898 | 1000)), so large means are checked against a plain sum.
const meanArb = fc.oneof(
  fc.double({ min: 0.01, max: 50, noNaN: true }),
  fc.double({ min: 50, max: 200, noNaN: true }),
);
const largeMeanArb = fc.double({ min: 200, max: 200_000, noNaN: true });

/** P(X ≤ k | mean) as Σ exp(−μ + j ln μ − ln j!), ln j! summed term by term. */
function plainCdf(k: number, mean: number): number {
  let lnFactorial = 0;
  let sum = 0;
  for (let j = 0; j <= k; j++) {
    if (j > 0) lnFactorial += Math.log(j);
    sum += Math.exp(-mean + j * Math.log(mean) - lnFactorial);
  }
  return sum;
}

describe('Poisson distribution', () => {
  it('matches small exact values and @stdlib’s CDF and quantile', () => {
    expect(poissonPmf(2, 3)).toBeCloseTo((Math.exp(-3) * 9) / 2, 15);
    expect(poissonCdf(0, 2)).toBeCloseTo(Math.exp(-2), 15);
    expect(poissonSurvival(-1, 2)).toBe(1);
    expect(poissonCdf(5, 0)).toBe(1);
    expect(poissonQuantile(0.5, 0)).toBe(0);
    fc.assert(
      fc.property(meanArb, fc.double({ min: 0.0005, max: 0.9995, noNaN: true }), (mean, q) => {
        const k = stdlibPoissonQuantile(q, mean);
        expect(poissonQuantile(q, mean) - k).toBe(0); // @stdlib answers −0 for 0
        expect(poissonCdf(k, mean)).toBeCloseTo(stdlibPoissonCdf(k, mean), 10);
        expect(poissonCdf(k, mean) + poissonSurvival(k, mean)).toBeCloseTo(1, 12);
      }),
      { numRuns: 300 },
    );
  });

  it('matches a plain sum of the pmf at large means, tails included', () => {
    fc.assert(
      fc.property(largeMeanArb, fc.double({ min: -4, max: 4, noNaN: true }), (mean, z) => {
        const k = Math.max(0, Math.floor(mean + z * Math.sqrt(mean)));
        const cdf = poissonCdf(k, mean);
        expect(cdf / plainCdf(k, mean)).toBeCloseTo(1, 7);
        const q = poissonQuantile(cdf, mean);
        expect(q).toBeLessThanOrEqual(k);
        expect(poissonCdf(q, mean)).toBeGreaterThanOrEqual(cdf);
      }),
      { numRuns: 100 },
    );
  });
});

describe('exact Poisson interval (Garwood 1936)', () => {
  it('gives the published 95% limits for small counts', () => {
    // Exact 95% limits for a Poisson count as tabled in Breslow & Day (1987) vol. II and the
    // Documenta Geigy Scientific Tables (values from memory, to the printed precision; each
    // is χ²(0.025; 2x)/2 and χ²(0.975; 2x + 2)/2, checked against @stdlib below).
    const table: [number, number, number][] = [
      [0, 0, 3.689],
      [1, 0.0253, 5.572],
      [2, 0.2422, 7.225],
      [3, 0.6187, 8.767],
      [4, 1.0899, 10.242],
      [5, 1.6235, 11.668],
      [10, 4.7954, 18.39],
      [20, 12.2165, 30.8884],
    ];
    for (const [x, lower, upper] of table) {
      const ci = poissonInterval(x);
      expect(ci.lower, `lower for ${x}`).toBeCloseTo(lower, 3);
      expect(ci.upper, `upper for ${x}`).toBeCloseTo(upper, 3);
    }
    expect(poissonInterval(0).upper).toBeCloseTo(-Math.log(0.025), 12); // closed form at 0
    expect(poissonInterval(1).lower).toBeCloseTo(-Math.log(0.975), 12);
  });

  it('agrees with @stdlib’s chi-square and gamma quantiles', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 60 }),
        fc.constantFrom(0.8, 0.9, 0.95, 0.99, 0.998),
        (x, confidence) => {
          const tail = (1 - confidence) / 2;
          const ci = poissonInterval(x, confidence);
          const lower = x === 0 ? 0 : stdlibChisquareQuantile(tail, 2 * x) / 2;
          expect(ci.lower).toBeCloseTo(lower, 6);
          expect(ci.upper / (stdlibChisquareQuantile(1 - tail, 2 * x + 2) / 2)).toBeCloseTo(1, 8);
          expect(ci.upper / stdlibGammaQuantile(1 - tail, x + 1, 1)).toBeCloseTo(1, 8);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('puts exactly α/2 in each tail at large counts (checked on a plain sum)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 60, max: 20_000 }),
        fc.constantFrom(0.95, 0.998),
        (x, confidence) => {
          const tail = (1 - confidence) / 2;
          const ci = poissonInterval(x, confidence);
          expect((1 - plainCdf(x - 1, ci.lower)) / tail).toBeCloseTo(1, 5);
          expect(plainCdf(x, ci.upper) / tail).toBeCloseTo(1, 5);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('rejects a count that is not a non-negative integer', () => {
    expect(() => poissonInterval(1.5)).toThrow(RangeError);
    expect(() => poissonInterval(-1)).toThrow(RangeError);
    expect(() => poissonInterval(3, 1)).toThrow(RangeError);
  });
});

/** Spiegelhalter (2005) exact limits with interpolation, written out on @stdlib's Poisson. */
function referenceLimit(q: number, expected: number): number {
  const r = stdlibPoissonQuantile(q, expected);
  const atR = stdlibPoissonCdf(r, expected);
  const belowR = r > 0 ? stdlibPoissonCdf(r - 1, expected) : 0;
  const alpha = atR > belowR ? (atR - q) / (atR - belowR) : 0;
  return Math.max(0, (r - alpha) / expected);
}

describe('funnel limits for a standardized ratio (Spiegelhalter 2005)', () => {
  it('agree with the interpolated exact limits computed on @stdlib’s Poisson', () => {
    fc.assert(
      fc.property(meanArb, fc.constantFrom(0.95, 0.998), (expected, coverage) => {
        const tail = (1 - coverage) / 2;
        const limits = ratioFunnelLimits(expected, coverage)!;
        expect(limits.lower).toBeCloseTo(referenceLimit(tail, expected), 9);
        expect(limits.upper).toBeCloseTo(referenceLimit(1 - tail, expected), 9);
        expect(limits.lower).toBeLessThanOrEqual(1);
        // Below one expected event the interpolated upper line can dip under 1 (even to 0).
        if (expected >= 1) expect(limits.upper).toBeGreaterThanOrEqual(1);
      }),
      { numRuns: 300 },
    );
  });

  it('work out by hand at E = 10 and narrow to 1 ± z/√E at large E', () => {
    // E = 10, 99.8% upper, by hand: P(O ≤ 20) = 0.998412 < 0.999 ≤ P(O ≤ 21) = 0.999300, so
    // r = 21, α = (0.999300 − 0.999)/(0.999300 − 0.998412) = 0.3380 and the limit 2.0662.
    expect(ratioFunnelLimits(10, 0.998)!.upper).toBeCloseTo(2.0662, 4);
    const e = 100_000;
    const z = stdlibNormalQuantile(0.975, 0, 1);
    const limits = ratioFunnelLimits(e, 0.95)!;
    expect(limits.lower).toBeCloseTo(1 - z / Math.sqrt(e), 3);
    expect(limits.upper).toBeCloseTo(1 + z / Math.sqrt(e), 3);
    expect(ratioFunnelLimits(0, 0.95)).toBeNull();
  });
});

describe('standardized ratio and its band', () => {
  it('ratio interval contains the ratio', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 5000 }),
        fc.double({ min: 0.001, max: 5000, noNaN: true }),
        (observed, expected) => {
          const sr = standardizedRatio(observed, expected);
          expect(sr.interval!.lower).toBeLessThanOrEqual(sr.ratio!);
          expect(sr.interval!.upper).toBeGreaterThanOrEqual(sr.ratio!);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('flags a clear excess and a clear shortfall, high and low', () => {
    // 25 comebacks where 10 were expected: P(O ≥ 25 | 10) ≈ 5e-5 < 0.001.
    expect(ratioBand(25, 10)).toEqual({ band: 'out of line', side: 'high', note: null });
    // 18 where 10 were expected: P(O ≥ 18 | 10) ≈ 0.014, between 0.001 and 0.025.
    expect(ratioBand(18, 10)).toEqual({ band: 'on watch', side: 'high', note: null });
    // 65 where 100 were expected: P(O ≤ 65 | 100) ≈ 1.2e-4.
    expect(ratioBand(65, 100)).toEqual({ band: 'out of line', side: 'low', note: null });
    expect(ratioBand(10, 10)).toEqual({ band: 'in line', side: null, note: null });
  });

  it('never gives a band that the count’s own uncertainty does not support', () => {
    // One comeback where 0.1 was expected lies above the interpolated 95% line (7.75) but
    // P(O ≥ 1 | 0.1) = 0.095: in line, and the note says why.
    expect(ratioFunnelLimits(0.1, 0.95)!.upper).toBeLessThan(10);
    expect(ratioBand(1, 0.1, { minExpected: 0 })).toEqual({
      band: 'in line',
      side: null,
      note: 'within its own uncertainty',
    });
    expect(ratioBand(3, 0.4)).toEqual({
      band: 'in line',
      side: null,
      note: 'too little follow-up',
    });
    expect(ratioBand(2, 0)).toEqual({ band: 'in line', side: null, note: 'nothing expected' });
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 60 }),
        fc.double({ min: 0.01, max: 40, noNaN: true }),
        (observed, expected) => {
          const { band } = ratioBand(observed, expected, { minExpected: 0 });
          const sr = standardizedRatio(observed, expected, band === 'out of line' ? 0.998 : 0.95);
          if (band !== 'in line') {
            expect(sr.interval!.lower > 1 || sr.interval!.upper < 1).toBe(true);
          }
        },
      ),
      { numRuns: 500 },
    );
  });

  it('compares shops in input order with funnels at their own E', () => {
    const rows = compareRatios([
      { shopId: 'a', observed: 25, expected: 10 },
      { shopId: 'b', observed: 0, expected: 0 },
    ]);
    expect(rows.map((r) => r.shopId)).toEqual(['a', 'b']);
    expect(rows[0]).toMatchObject({ ratio: 2.5, band: 'out of line', side: 'high' });
    expect(rows[0]!.funnel998).toEqual(ratioFunnelLimits(10, 0.998));
    expect(rows[1]).toMatchObject({ ratio: null, interval: null, funnel95: null, band: 'in line' });
  });
});
