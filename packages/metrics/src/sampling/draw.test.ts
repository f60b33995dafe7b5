import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { drawSample } from './draw';

const jobs = Array.from({ length: 10 }, (_, i) => `job-${i}`);

describe('drawSample', () => {
  it('draws from seedrandom("hello.") whose first value is 0.9282578795792454 (seedrandom README)', () => {
    // ⌊0.928… × 10⌋ = 9: the first job drawn is the tenth.
    expect(drawSample(jobs, 1, 'hello.')).toEqual(['job-9']);
  });

  it('gives the same sample for the same items and seed, and a different one for another seed', () => {
    const a = drawSample(jobs, 4, 'round-2025-03/shop-1');
    expect(drawSample(jobs, 4, 'round-2025-03/shop-1')).toEqual(a);
    expect(drawSample(jobs, 4, 'round-2025-03/shop-2')).not.toEqual(a);
  });

  it('gives every item once when size ≥ items, [] for size 0, and leaves the input alone', () => {
    const all = drawSample(jobs, 25, 'seed');
    expect(all).toHaveLength(10);
    expect([...all].sort()).toEqual([...jobs].sort());
    expect(drawSample(jobs, 0, 'seed')).toEqual([]);
    expect(drawSample([], 3, 'seed')).toEqual([]);
    expect(jobs[0]).toBe('job-0');
    expect(() => drawSample(jobs, -1, 'seed')).toThrow(RangeError);
    expect(() => drawSample(jobs, 1.5, 'seed')).toThrow(RangeError);
  });

  it('draws distinct items, a prefix of the larger sample for the same seed', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 60 }),
        fc.integer({ min: 0, max: 60 }),
        fc.string(),
        (n, k, seed) => {
          const items = Array.from({ length: n }, (_, i) => i);
          const sample = drawSample(items, k, seed);
          expect(sample).toHaveLength(Math.min(k, n));
          expect(new Set(sample).size).toBe(sample.length);
          expect(drawSample(items, n, seed).slice(0, sample.length)).toEqual(sample);
        },
      ),
    );
  });

  it('gives each item about the same chance of being drawn', () => {
    const hits = new Array<number>(10).fill(0);
    for (let s = 0; s < 4000; s++)
      for (const j of drawSample(jobs, 3, `s${s}`)) hits[Number(j.slice(4))]!++;
    // Expected 1200 each; 5 standard deviations is about ±145.
    for (const h of hits) expect(Math.abs(h - 1200)).toBeLessThan(150);
  });
});
