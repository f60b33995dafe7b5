import { describe, expect, it } from 'vitest';
import { sampleSizeCodeLetter, singleSamplingPlan, tablePlan } from './plan';
import {
  AQLS,
  INSPECTION_LEVELS,
  MASTER_TABLES,
  REDUCED_SAMPLE_SIZES,
  SAMPLE_SIZES,
} from './tables';

describe('sampleSizeCodeLetter (MIL-STD-105E Table I)', () => {
  it('gives H for lots of 281–500 and F for 91–150 at general level II', () => {
    expect(sampleSizeCodeLetter(281)).toBe('H');
    expect(sampleSizeCodeLetter(500)).toBe('H');
    expect(sampleSizeCodeLetter(91)).toBe('F');
    expect(sampleSizeCodeLetter(150)).toBe('F');
    expect(sampleSizeCodeLetter(151)).toBe('G');
  });

  it('reads every level of the 501–1200 row: C C E F | G J K', () => {
    expect(INSPECTION_LEVELS.map((level) => sampleSizeCodeLetter(1000, level))).toEqual([
      'C',
      'C',
      'E',
      'F',
      'G',
      'J',
      'K',
    ]);
  });

  it('reads the first and last rows', () => {
    expect(INSPECTION_LEVELS.map((level) => sampleSizeCodeLetter(2, level))).toEqual([
      'A',
      'A',
      'A',
      'A',
      'A',
      'A',
      'B',
    ]);
    expect(INSPECTION_LEVELS.map((level) => sampleSizeCodeLetter(600_000, level))).toEqual([
      'D',
      'E',
      'H',
      'K',
      'N',
      'Q',
      'R',
    ]);
    expect(sampleSizeCodeLetter(10_000)).toBe('L');
    expect(sampleSizeCodeLetter(10_001)).toBe('M');
  });

  it('rejects lot sizes that are not positive integers and unknown levels', () => {
    expect(() => sampleSizeCodeLetter(0)).toThrow(RangeError);
    expect(() => sampleSizeCodeLetter(12.5)).toThrow(RangeError);
    expect(() => sampleSizeCodeLetter(100, 'IV' as never)).toThrow(RangeError);
  });
});

describe('singleSamplingPlan, normal inspection (MIL-STD-105E Table II-A)', () => {
  it('gives H: n = 50, Ac 3, Re 4 at AQL 2.5 for a lot of 400', () => {
    expect(singleSamplingPlan(400, 2.5)).toMatchObject({
      codeLetter: 'H',
      sampleSize: 50,
      accept: 3,
      reject: 4,
    });
  });

  it('gives F: n = 20, Ac 1, Re 2 at AQL 2.5 for a lot of 120', () => {
    expect(singleSamplingPlan(120, 2.5)).toMatchObject({
      codeLetter: 'F',
      sampleSize: 20,
      accept: 1,
      reject: 2,
    });
  });

  it('reads the J row (n = 80) across AQL 0.65–6.5: 1/2, 2/3, 3/4, 5/6, 7/8, 10/11', () => {
    const row = [0.65, 1.0, 1.5, 2.5, 4.0, 6.5].map((aql) => {
      const plan = singleSamplingPlan(1000, aql);
      return [plan.sampleSize, plan.accept, plan.reject];
    });
    expect(row).toEqual([
      [80, 1, 2],
      [80, 2, 3],
      [80, 3, 4],
      [80, 5, 6],
      [80, 7, 8],
      [80, 10, 11],
    ]);
  });

  it('reads the L row (n = 200): 5/6 at 1.0, 10/11 at 2.5, 14/15 at 4.0, 21/22 at 6.5', () => {
    expect([1.0, 2.5, 4.0, 6.5].map((aql) => singleSamplingPlan(5000, aql).accept)).toEqual([
      5, 10, 14, 21,
    ]);
  });

  it('follows the arrows: F at AQL 1.0 goes up to E (13, 0/1), at 1.5 down to G (32, 1/2)', () => {
    expect(singleSamplingPlan(120, 1.0)).toMatchObject({
      lotCodeLetter: 'F',
      codeLetter: 'E',
      sampleSize: 13,
      accept: 0,
      reject: 1,
    });
    expect(singleSamplingPlan(120, 1.5)).toMatchObject({
      lotCodeLetter: 'F',
      codeLetter: 'G',
      sampleSize: 32,
      accept: 1,
      reject: 2,
    });
    // The accept number of the table tops out at 21 for AQLs up to 10.
    expect(singleSamplingPlan(5000, 10)).toMatchObject({
      codeLetter: 'K',
      sampleSize: 125,
      accept: 21,
    });
  });

  it('never samples more than the lot: the whole lot is inspected with the same numbers', () => {
    // Lot of 3 → A; at AQL 10 the arrow leads to C (n = 5, 1/2).
    expect(singleSamplingPlan(3, 10)).toMatchObject({
      sampleSize: 3,
      accept: 1,
      reject: 2,
      hundredPercent: true,
    });
    expect(singleSamplingPlan(15, 0.65)).toMatchObject({
      sampleSize: 15,
      accept: 0,
      reject: 1,
      hundredPercent: true,
    });
    expect(singleSamplingPlan(400, 2.5).hundredPercent).toBe(false);
  });

  it('uses other inspection levels', () => {
    expect(singleSamplingPlan(400, 2.5, { level: 'I' })).toMatchObject({
      codeLetter: 'F',
      sampleSize: 20,
      accept: 1,
    });
    expect(singleSamplingPlan(400, 2.5, { level: 'III' })).toMatchObject({
      codeLetter: 'J',
      sampleSize: 80,
      accept: 5,
    });
  });

  it('rejects an AQL that is not a column of the table', () => {
    expect(() => singleSamplingPlan(400, 3)).toThrow(RangeError);
    expect(() => singleSamplingPlan(400, 15)).toThrow(RangeError);
  });
});

describe('singleSamplingPlan, tightened (Table II-B) and reduced (Table II-C)', () => {
  it('tightens J at AQL 2.5 to 3/4 and H to 2/3, with the normal sample sizes', () => {
    expect(singleSamplingPlan(1000, 2.5, { severity: 'tightened' })).toMatchObject({
      sampleSize: 80,
      accept: 3,
      reject: 4,
    });
    expect(singleSamplingPlan(400, 2.5, { severity: 'tightened' })).toMatchObject({
      sampleSize: 50,
      accept: 2,
      reject: 3,
    });
  });

  it('reaches the tightened-only letter S (n = 3150) at AQL 0.025', () => {
    expect(tablePlan('tightened', 'R', 0.025)).toEqual({
      codeLetter: 'S',
      sampleSize: 3150,
      accept: 1,
      reject: 2,
    });
  });

  it('reduces J at AQL 2.5 to n = 32, Ac 2, Re 5 and H to n = 20, 1/4', () => {
    expect(singleSamplingPlan(1000, 2.5, { severity: 'reduced' })).toMatchObject({
      sampleSize: 32,
      accept: 2,
      reject: 5,
    });
    expect(singleSamplingPlan(400, 2.5, { severity: 'reduced' })).toMatchObject({
      sampleSize: 20,
      accept: 1,
      reject: 4,
    });
  });

  it('finds a plan in every cell, and the tables keep their shape', () => {
    for (const severity of ['normal', 'tightened', 'reduced'] as const) {
      const sizes = severity === 'reduced' ? REDUCED_SAMPLE_SIZES : SAMPLE_SIZES;
      for (const letter of 'ABCDEFGHJKLMNPQR') {
        let previous = -1;
        for (const aql of AQLS) {
          const plan = tablePlan(severity, letter, aql);
          expect(plan.sampleSize).toBe(sizes[plan.codeLetter]);
          expect(plan.reject).toBeGreaterThan(plan.accept);
          // At a fixed sample size, a looser AQL never accepts fewer.
          if (plan.codeLetter === letter) {
            expect(plan.accept).toBeGreaterThanOrEqual(previous);
            previous = plan.accept;
          }
          if (severity === 'tightened' && plan.codeLetter !== 'S') {
            const normal = tablePlan('normal', plan.codeLetter, aql);
            if (normal.codeLetter === plan.codeLetter)
              expect(plan.accept).toBeLessThanOrEqual(normal.accept);
          }
        }
      }
    }
    expect(MASTER_TABLES.tightened.letters).toContain('S');
  });
});
