import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import stdlibNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clopperPearsonInterval, wilsonInterval } from './intervals';

const countsArb = fc
  .integer({ min: 1, max: 5000 })
  .chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n)));
const confidenceArb = fc.constantFrom(0.8, 0.9, 0.95, 0.99, 0.998);

describe('wilsonInterval', () => {
  it('reproduces Newcombe (1998) Table I, method 3: 81/263 → 0.2553–0.3662', () => {
    const ci = wilsonInterval(81, 263)!;
    expect(ci.lower).toBeCloseTo(0.2553, 4);
    expect(ci.upper).toBeCloseTo(0.3662, 4);
  });

  it('reproduces Newcombe (1998) Table I, method 3: 15/148 → 0.0624–0.1605', () => {
    const ci = wilsonInterval(15, 148)!;
    expect(ci.lower).toBeCloseTo(0.0624, 4);
    expect(ci.upper).toBeCloseTo(0.1605, 4);
  });

  it('reproduces Newcombe (1998) method 3 for 0/20 → 0–0.1611 and 1/29 → 0.0061–0.1718 (from memory)', () => {
    expect(wilsonInterval(0, 20)!.lower).toBe(0);
    expect(wilsonInterval(0, 20)!.upper).toBeCloseTo(0.1611, 4);
    expect(wilsonInterval(1, 29)!.lower).toBeCloseTo(0.0061, 4);
    expect(wilsonInterval(1, 29)!.upper).toBeCloseTo(0.1718, 4);
  });

  it('is null with no trials, reaches 1 at x = n, and rejects bad counts', () => {
    expect(wilsonInterval(0, 0)).toBeNull();
    expect(wilsonInterval(7, 7)!.upper).toBe(1);
    expect(() => wilsonInterval(3, 2)).toThrow(RangeError);
    expect(() => wilsonInterval(1.5, 2)).toThrow(RangeError);
    expect(() => wilsonInterval(1, 2, 1)).toThrow(RangeError);
  });

  it('agrees with the score formula built on @stdlib normal quantile', () => {
    fc.assert(
      fc.property(countsArb, confidenceArb, ([x, n], confidence) => {
        const z = stdlibNormalQuantile(1 - (1 - confidence) / 2, 0, 1);
        const p = x / n;
        const centre = (p + (z * z) / (2 * n)) / (1 + (z * z) / n);
        const half = (z / (1 + (z * z) / n)) * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
        const ci = wilsonInterval(x, n, confidence)!;
        expect(ci.lower).toBeCloseTo(Math.max(0, centre - half), 12);
        expect(ci.upper).toBeCloseTo(Math.min(1, centre + half), 12);
        expect(ci.lower).toBeLessThanOrEqual(p);
        expect(ci.upper).toBeGreaterThanOrEqual(p);
      }),
      { numRuns: 500 },
    );
  });
});

describe('clopperPearsonInterval', () => {
  it('reproduces Newcombe (1998) Table I, method 5 (exact): 81/263 → 0.2527–0.3676, 15/148 → 0.0578–0.1617 (from memory, matches @stdlib)', () => {
    const a = clopperPearsonInterval(81, 263)!;
    expect(a.lower).toBeCloseTo(0.2527, 4);
    expect(a.upper).toBeCloseTo(0.3676, 4);
    const b = clopperPearsonInterval(15, 148)!;
    expect(b.lower).toBeCloseTo(0.0578, 4);
    expect(b.upper).toBeCloseTo(0.1617, 4);
  });

  it('reproduces Newcombe (1998) method 5 for 0/20 → 0–0.1684 and 1/29 → 0.0009–0.1776 (from memory)', () => {
    expect(clopperPearsonInterval(0, 20)).toEqual({
      lower: 0,
      upper: expect.closeTo(0.1684, 4) as number,
    });
    expect(clopperPearsonInterval(1, 29)!.lower).toBeCloseTo(0.0009, 4);
    expect(clopperPearsonInterval(1, 29)!.upper).toBeCloseTo(0.1776, 4);
  });

  it('has the closed form 1 − (α/2)^(1/n) for zero successes (Clopper & Pearson 1934)', () => {
    expect(clopperPearsonInterval(0, 10)!.upper).toBeCloseTo(1 - 0.025 ** (1 / 10), 12);
    expect(clopperPearsonInterval(10, 10)!.lower).toBeCloseTo(0.025 ** (1 / 10), 12);
  });

  it('is null with no trials', () => {
    expect(clopperPearsonInterval(0, 0)).toBeNull();
  });

  it('agrees with @stdlib beta quantiles', () => {
    fc.assert(
      fc.property(countsArb, confidenceArb, ([x, n], confidence) => {
        const tail = (1 - confidence) / 2;
        const lower = x === 0 ? 0 : betaQuantile(tail, x, n - x + 1);
        const upper = x === n ? 1 : betaQuantile(1 - tail, x + 1, n - x);
        const ci = clopperPearsonInterval(x, n, confidence)!;
        expect(Math.abs(ci.lower - lower)).toBeLessThanOrEqual(1e-9 * Math.max(lower, 1e-6));
        expect(Math.abs(ci.upper - upper)).toBeLessThanOrEqual(1e-9 * Math.max(upper, 1e-6));
      }),
      { numRuns: 300 },
    );
  });
});
