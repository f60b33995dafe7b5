import { describe, expect, it } from 'vitest';
import { summariseSortedRuns, TURNAROUND_DIGITS } from './sorted-runs';
import { turnaroundSummary } from './turnaround';

const encode = (values: number[]) =>
  [...values]
    .sort((a, b) => a - b)
    .map((v) => String(v).padStart(TURNAROUND_DIGITS, '0'))
    .join('');

describe('summariseSortedRuns', () => {
  it('gives the metrics engine’s type 7 median and p90 of the runs’ union', () => {
    // Hyndman & Fan (1996) definition 7 on 1…10: h = 9 × 0.5 = 4.5 → 5.5; h = 9 × 0.9 = 8.1 → 9.1
    // (R: quantile(1:10, c(0.5, 0.9)) gives 5.5 and 9.1).
    expect(
      summariseSortedRuns([encode([2, 4, 6, 8, 10]), encode([1, 3, 5, 7, 9])].join('|')),
    ).toEqual({
      count: 10,
      median: 5.5,
      p90: 9.1,
    });
  });

  it('agrees with turnaroundSummary on random runs, empty runs, ties and months of jobs', () => {
    let seed = 7;
    const rand = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31) / 2 ** 31;
    for (let trial = 0; trial < 300; trial++) {
      // Short runs with many ties, and runs the size of a busy shop's month (up to 1,500 jobs).
      const longest = trial % 3 === 0 ? 1_500 : 40;
      const spread = trial % 2 === 0 ? 30 : 30_000;
      const runs = Array.from({ length: 1 + Math.floor(rand() * 6) }, () =>
        Array.from({ length: Math.floor(rand() * longest) }, () => Math.floor(rand() * spread)),
      );
      const all = runs.flat();
      const got = summariseSortedRuns(runs.map(encode).join('|'));
      const want = turnaroundSummary(all);
      expect(got.count).toBe(want.count);
      if (want.median === null) expect(got.median).toBeNull();
      else expect(got.median).toBeCloseTo(want.median, 9);
      if (want.p90 === null) expect(got.p90).toBeNull();
      else expect(got.p90).toBeCloseTo(want.p90, 9);
    }
  });

  it('has no quantiles for no jobs, and reads the largest value the width allows', () => {
    expect(summariseSortedRuns(null)).toEqual({ count: 0, median: null, p90: null });
    expect(summariseSortedRuns('|')).toEqual({ count: 0, median: null, p90: null });
    expect(summariseSortedRuns(encode([9_999_999]))).toEqual({
      count: 1,
      median: 9_999_999,
      p90: 9_999_999,
    });
  });
});
