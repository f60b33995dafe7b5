import { quantileSorted as d3QuantileSorted } from 'd3-array';
import fc from 'fast-check';
import { quantileSorted as ssQuantileSorted } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { quantile, quantileSorted } from './quantile';

describe('quantile (Hyndman & Fan type 7)', () => {
  it('gives 29 for {15, 20, 35, 40, 50} at p = 0.4 — Hyndman & Fan (1996), The American Statistician 50(4)', () => {
    // Type 6 would give 26 on the same data.
    expect(quantile([15, 20, 35, 40, 50], 0.4)).toBeCloseTo(29, 12);
    expect(quantile([50, 40, 35, 20, 15], 0.4)).toBeCloseTo(29, 12);
  });

  it('returns the extremes at p = 0 and p = 1 and the value itself for one element', () => {
    expect(quantile([3, 1, 2], 0)).toBe(1);
    expect(quantile([3, 1, 2], 1)).toBe(3);
    expect(quantile([7], 0.9)).toBe(7);
  });

  it('does not reorder its input', () => {
    const values = [3, 1, 2];
    quantile(values, 0.5);
    expect(values).toEqual([3, 1, 2]);
  });

  it('throws RangeError on empty input, NaN and p outside [0, 1]', () => {
    expect(() => quantile([], 0.5)).toThrow(RangeError);
    expect(() => quantile([1, Number.NaN], 0.5)).toThrow(RangeError);
    expect(() => quantile([1], -0.1)).toThrow(RangeError);
    expect(() => quantile([1], 1.1)).toThrow(RangeError);
    expect(() => quantile([1], Number.NaN)).toThrow(RangeError);
    expect(() => quantileSorted([], 0.5)).toThrow(RangeError);
  });

  const values = fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), {
    minLength: 1,
    maxLength: 60,
  });
  const probability = fc.double({ min: 0, max: 1, noNaN: true });

  it('agrees with d3-array quantileSorted on random data', () => {
    fc.assert(
      fc.property(values, probability, (xs, p) => {
        const sorted = [...xs].sort((a, b) => a - b);
        const expected = d3QuantileSorted(sorted, p)!;
        expect(Math.abs(quantile(xs, p) - expected)).toBeLessThanOrEqual(
          1e-9 * (1 + Math.abs(expected)),
        );
      }),
      { numRuns: 500 },
    );
  });

  it('agrees with simple-statistics quantileSorted (type 7 since 7.8.9) on random data', () => {
    fc.assert(
      fc.property(values, probability, (xs, p) => {
        const sorted = [...xs].sort((a, b) => a - b);
        const expected = ssQuantileSorted(sorted, p);
        expect(Math.abs(quantile(xs, p) - expected)).toBeLessThanOrEqual(
          1e-9 * (1 + Math.abs(expected)),
        );
      }),
      { numRuns: 500 },
    );
  });
});
