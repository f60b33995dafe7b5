import stdlibCdf from '@stdlib/stats-base-dists-binomial-cdf';
import stdlibQuantile from '@stdlib/stats-base-dists-binomial-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { binomialCdf, binomialPmf, binomialQuantile, binomialSurvival } from './binomial';

const trialsArb = fc.oneof(
  fc.integer({ min: 1, max: 200 }),
  fc.integer({ min: 200, max: 1_000_000 }),
);
const rateArb = fc.oneof(
  fc.double({ min: 0.0005, max: 0.9995, noNaN: true }),
  fc.constantFrom(0.01, 0.05, 0.2, 0.5),
);

describe('binomial distribution', () => {
  it('matches small exact values', () => {
    // Binomial(4, ½): 1, 4, 6, 4, 1 sixteenths.
    expect(binomialPmf(2, 4, 0.5)).toBeCloseTo(6 / 16, 15);
    expect(binomialCdf(1, 4, 0.5)).toBeCloseTo(5 / 16, 15);
    expect(binomialSurvival(2, 4, 0.5)).toBeCloseTo(5 / 16, 15);
    expect(binomialCdf(-1, 4, 0.5)).toBe(0);
    expect(binomialCdf(4, 4, 0.5)).toBe(1);
    expect(binomialCdf(0, 10, 0)).toBe(1);
    expect(binomialCdf(9, 10, 1)).toBe(0);
    expect(binomialQuantile(0.4, 20, 0.2)).toBe(3); // @stdlib's documented examples
    expect(binomialQuantile(0.8, 20, 0.2)).toBe(5);
    expect(binomialQuantile(1, 10, 0.4)).toBe(10);
    expect(binomialQuantile(0, 10, 0.4)).toBe(0);
  });

  it('sums to one and stays finite for a million trials', () => {
    let total = 0;
    for (let k = 499_000; k <= 501_000; k++) total += binomialPmf(k, 1_000_000, 0.5);
    expect(total).toBeCloseTo(1 - 2 * binomialCdf(498_999, 1_000_000, 0.5), 12);
    expect(binomialQuantile(0.5, 1_000_000, 0.5)).toBe(500_000);
  });

  it('rejects bad arguments', () => {
    expect(() => binomialCdf(1, 2.5, 0.5)).toThrow(RangeError);
    expect(() => binomialCdf(1, 10, 1.5)).toThrow(RangeError);
    expect(() => binomialQuantile(1.5, 10, 0.5)).toThrow(RangeError);
  });

  it('agrees with @stdlib binomial CDF', () => {
    fc.assert(
      fc.property(trialsArb, rateArb, fc.double({ min: 0, max: 1, noNaN: true }), (n, p, u) => {
        const mean = n * p;
        const sd = Math.sqrt(mean * (1 - p));
        const k = Math.max(0, Math.min(n, Math.round(mean + (u - 0.5) * 12 * sd)));
        const expected = stdlibCdf(k, n, p);
        expect(Math.abs(binomialCdf(k, n, p) - expected)).toBeLessThanOrEqual(1e-10);
      }),
      { numRuns: 400 },
    );
  });

  it('agrees with @stdlib binomial quantile', () => {
    fc.assert(
      fc.property(
        trialsArb,
        rateArb,
        fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }),
        (n, p, q) => {
          const mine = binomialQuantile(q, n, p);
          const theirs = stdlibQuantile(q, n, p);
          if (mine !== theirs) {
            // Only a tie within rounding of the CDF at the boundary may differ.
            expect(Math.abs(mine - theirs)).toBe(1);
            expect(Math.abs(stdlibCdf(Math.min(mine, theirs), n, p) - q)).toBeLessThan(1e-12);
          }
          expect(binomialCdf(mine, n, p)).toBeGreaterThanOrEqual(q - 1e-12);
          if (mine > 0) expect(binomialCdf(mine - 1, n, p)).toBeLessThan(q + 1e-12);
        },
      ),
      { numRuns: 400 },
    );
  });
});
