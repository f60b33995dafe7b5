import stdlibNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { normalQuantile } from './normal';

/** ln Φ(x) for x ≪ 0 from the asymptotic series of Mills' ratio (Abramowitz & Stegun 26.2.12). */
function logLowerTail(x: number): number {
  let term = 1;
  let sum = 1;
  for (let k = 1; k <= 12; k++) {
    term *= -(2 * k - 1) / (x * x);
    sum += term;
  }
  return -0.5 * x * x - 0.5 * Math.log(2 * Math.PI) - Math.log(-x) + Math.log(sum);
}

describe('normalQuantile (AS 241)', () => {
  it('gives the familiar critical values', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14);
    expect(normalQuantile(0.999)).toBeCloseTo(3.090232306167813, 13);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
  });

  it('agrees with @stdlib normal quantile on [1e-6, 1 - 1e-6]', () => {
    // Outside that range @stdlib loses digits in the lower tail (it works from 1 − p).
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true }), (p) => {
        const expected = stdlibNormalQuantile(p, 0, 1);
        const tolerance =
          Math.max(1e-12, 1e-16 / Math.min(p, 1 - p)) * Math.max(1, Math.abs(expected));
        expect(Math.abs(normalQuantile(p) - expected)).toBeLessThanOrEqual(tolerance);
      }),
      { numRuns: 1000 },
    );
  });

  it('stays accurate deep in the lower tail', () => {
    for (const p of [1e-20, 1e-50, 1e-100, 1e-300]) {
      expect(logLowerTail(normalQuantile(p))).toBeCloseTo(Math.log(p), 9);
    }
  });
});
