import { describe, expect, it } from 'vitest';
import { addDays, localDayStart, planFor } from './sampling';

// The plan a round gets (ISO 2859-1 / MIL-STD-105E tables, through the metrics engine) and the
// local dates a lot is bounded by; no database.

describe('sampling plans of ISO 2859-1 / MIL-STD-105E', () => {
  // MIL-STD-105E Table I (code letters) and Tables II-A/II-B/II-C (single sampling, master tables).
  it('lot 281–500 at level II is code H: n = 50, Ac 3 Re 4 at AQL 2.5 normal (Tables I, II-A)', () => {
    for (const lot of [281, 400, 500]) {
      expect(planFor(lot, 2.5, 'II', 'normal')).toMatchObject({
        codeLetter: 'H',
        planCodeLetter: 'H',
        sampleSize: 50,
        accept: 3,
        reject: 4,
        hundredPercent: false,
        table: 'II-A',
      });
    }
  });

  it('lot 91–150 at level II is code F: n = 20, Ac 1 Re 2 at AQL 2.5 normal (Tables I, II-A)', () => {
    for (const lot of [91, 132, 150]) {
      expect(planFor(lot, 2.5, 'II', 'normal')).toMatchObject({
        codeLetter: 'F',
        sampleSize: 20,
        accept: 1,
        reject: 2,
      });
    }
  });

  it('lot 501–1200 at level II is code J: n = 80, Ac 5 Re 6 at AQL 2.5 (Tables I, II-A)', () => {
    expect(planFor(800, 2.5, 'II', 'normal')).toMatchObject({
      codeLetter: 'J',
      sampleSize: 80,
      accept: 5,
      reject: 6,
    });
  });

  it('tightened inspection of code H at AQL 2.5 is n = 50, Ac 2 Re 3 (Table II-B)', () => {
    expect(planFor(400, 2.5, 'II', 'tightened')).toMatchObject({
      sampleSize: 50,
      accept: 2,
      reject: 3,
      table: 'II-B',
    });
  });

  it('level I and III move the code letter: lot 400 → F (n 20) and J (n 80) (Table I)', () => {
    expect(planFor(400, 2.5, 'I', 'normal')).toMatchObject({ codeLetter: 'F', sampleSize: 20 });
    expect(planFor(400, 2.5, 'III', 'normal')).toMatchObject({ codeLetter: 'J', sampleSize: 80 });
    expect(planFor(400, 2.5, 'S3', 'normal')).toMatchObject({ codeLetter: 'D' });
  });

  it('follows the arrows: lot 26–50 (code D) at AQL 2.5 uses code C, n = 5, Ac 0 Re 1 (Table II-A)', () => {
    expect(planFor(30, 2.5, 'II', 'normal')).toMatchObject({
      codeLetter: 'D',
      planCodeLetter: 'C',
      sampleSize: 5,
      accept: 0,
      reject: 1,
    });
  });

  it('a lot smaller than the sample size is inspected 100%', () => {
    expect(planFor(4, 2.5, 'II', 'normal')).toMatchObject({
      sampleSize: 4,
      hundredPercent: true,
      accept: 0,
      reject: 1,
    });
  });

  it('an empty lot or discontinued inspection has no plan', () => {
    expect(planFor(0, 2.5, 'II', 'normal')).toBeNull();
    expect(planFor(100, 2.5, 'II', 'discontinued')).toBeNull();
  });
});

describe('local dates', () => {
  it('a day starts at local midnight in the shop’s zone, across the clock change', () => {
    expect(localDayStart('2026-07-01', 'America/New_York').toISOString()).toBe(
      '2026-07-01T04:00:00.000Z',
    );
    expect(localDayStart('2026-11-02', 'America/New_York').toISOString()).toBe(
      '2026-11-02T05:00:00.000Z',
    );
    expect(localDayStart('2026-11-02', 'America/Chicago').toISOString()).toBe(
      '2026-11-02T06:00:00.000Z',
    );
    expect(addDays('2026-12-25', 14)).toBe('2027-01-08');
  });
});
