import stdlibCdf from '@stdlib/stats-base-dists-binomial-cdf';
import stdlibQuantile from '@stdlib/stats-base-dists-binomial-quantile';
import stdlibNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compareShops, fairnessBand, funnelLimits } from './funnel';

/** Spiegelhalter (2005) appendix A.1.1 written out on @stdlib's binomial functions. */
function referenceLimit(q: number, n: number, theta: number): number {
  const r = stdlibQuantile(q, n, theta);
  const atR = stdlibCdf(r, n, theta);
  const belowR = r > 0 ? stdlibCdf(r - 1, n, theta) : 0;
  const alpha = atR > belowR ? (atR - q) / (atR - belowR) : 0;
  return Math.min(1, Math.max(0, (r - alpha) / n));
}

describe('funnelLimits', () => {
  it('agrees with the appendix A.1.1 formula on @stdlib binomial quantile and CDF', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.integer({ min: 1, max: 500 }), fc.integer({ min: 500, max: 1_000_000 })),
        fc.double({ min: 0.001, max: 0.999, noNaN: true }),
        fc.constantFrom(0.95, 0.998),
        (n, theta, coverage) => {
          const tail = (1 - coverage) / 2;
          const limits = funnelLimits(n, theta, coverage);
          // The interpolation is continuous in p, so a quantile tie cannot move the limit.
          expect(limits.lower).toBeCloseTo(referenceLimit(tail, n, theta), 9);
          expect(limits.upper).toBeCloseTo(referenceLimit(1 - tail, n, theta), 9);
          expect(limits.lower).toBeLessThanOrEqual(limits.upper);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('narrows to the normal approximation θ ± z√(θ(1−θ)/n) at large volume', () => {
    const n = 1_000_000;
    const z = stdlibNormalQuantile(0.999, 0, 1);
    const half = z * Math.sqrt((0.05 * 0.95) / n);
    const limits = funnelLimits(n, 0.05, 0.998);
    expect(limits.lower).toBeCloseTo(0.05 - half, 5);
    expect(limits.upper).toBeCloseTo(0.05 + half, 5);
  });

  it('widens as volume falls and nests 95% inside 99.8%', () => {
    const small = funnelLimits(20, 0.1, 0.95);
    const large = funnelLimits(2000, 0.1, 0.95);
    const outer = funnelLimits(20, 0.1, 0.998);
    expect(small.upper - small.lower).toBeGreaterThan(large.upper - large.lower);
    expect(outer.lower).toBeLessThanOrEqual(small.lower);
    expect(outer.upper).toBeGreaterThanOrEqual(small.upper);
  });

  it('handles no trials and degenerate targets', () => {
    expect(funnelLimits(0, 0.1, 0.95)).toEqual({ lower: 0, upper: 1 });
    expect(funnelLimits(50, 0, 0.95)).toEqual({ lower: 0, upper: 0 });
    expect(funnelLimits(50, 1, 0.95)).toEqual({ lower: 1, upper: 1 });
    expect(fairnessBand(50, 50, 1)).toBe('in line');
    expect(fairnessBand(1, 50, 0)).toBe('out of line');
    expect(() => funnelLimits(10, 1.2, 0.95)).toThrow(RangeError);
    expect(() => funnelLimits(10, 0.2, 1)).toThrow(RangeError);
    expect(() => funnelLimits(-1, 0.2, 0.95)).toThrow(RangeError);
  });
});

describe('fairnessBand', () => {
  it('bands a shop by its own volume, high or low', () => {
    // Binomial(20, 0.1): the interpolated 95% upper limit is about 0.23, the 99.8% one about 0.34.
    expect(fairnessBand(2, 20, 0.1)).toBe('in line');
    expect(fairnessBand(5, 20, 0.1)).toBe('on watch');
    expect(fairnessBand(8, 20, 0.1)).toBe('out of line');
    expect(fairnessBand(0, 400, 0.1)).toBe('out of line');
    expect(fairnessBand(0, 0, 0.1)).toBe('in line');
  });
});

describe('compareShops', () => {
  it('finds the shop truly out of line and leaves the small shop with a high raw rate in line', () => {
    const result = compareShops([
      { shopId: 'harbor', events: 48, trials: 1000 },
      { shopId: 'point', events: 52, trials: 1100 },
      { shopId: 'flats', events: 80, trials: 900 },
      { shopId: 'lake', events: 3, trials: 25 },
    ]);
    expect(result.networkRate).toBeCloseTo(183 / 3025, 12);
    const band = Object.fromEntries(result.shops.map((s) => [s.shopId, s.band]));
    expect(band).toEqual({
      harbor: 'in line',
      point: 'in line',
      flats: 'out of line',
      lake: 'in line',
    });
    const lake = result.shops[3]!;
    expect(lake.rate).toBeCloseTo(0.12, 12);
    expect(lake.rate!).toBeGreaterThan(result.shops[2]!.rate!);
    expect(lake.interval!.lower).toBeLessThan(lake.rate!);
  });

  it('gives a null network rate and "in line" everywhere without trials', () => {
    const result = compareShops([{ shopId: 'new', events: 0, trials: 0 }]);
    expect(result.networkRate).toBeNull();
    expect(result.shops[0]).toMatchObject({ rate: null, interval: null, band: 'in line' });
    expect(compareShops([]).shops).toEqual([]);
  });
});
