import { describe, expect, it } from 'vitest';
import { type InspectedLot, type LotOutcome, nextSeverity } from './switching';

const times = (n: number, outcome: LotOutcome): LotOutcome[] => Array<LotOutcome>(n).fill(outcome);
const lots = (counts: number[], codeLetter: string, aql: number): InspectedLot[] =>
  counts.map((nonconforming) => ({ nonconforming, codeLetter, aql }));

describe('nextSeverity (ISO 2859-1:1999 §9.3–9.4)', () => {
  it('tightens when 2 of 5 or fewer consecutive lots are rejected (§9.3.1)', () => {
    expect(nextSeverity('normal', ['accepted', 'rejected', 'accepted', 'rejected'])).toBe(
      'tightened',
    );
    expect(
      nextSeverity('normal', ['rejected', 'accepted', 'accepted', 'accepted', 'rejected']),
    ).toBe('tightened');
    expect(
      nextSeverity('normal', [
        'rejected',
        'accepted',
        'accepted',
        'accepted',
        'accepted',
        'rejected',
      ]),
    ).toBe('normal');
    expect(nextSeverity('normal', [])).toBe('normal');
  });

  it('returns to normal after 5 consecutive accepted lots on tightened (§9.3.2)', () => {
    expect(nextSeverity('tightened', times(4, 'accepted'))).toBe('tightened');
    expect(nextSeverity('tightened', times(5, 'accepted'))).toBe('normal');
    expect(
      nextSeverity('tightened', ['rejected', ...times(4, 'accepted'), 'rejected', 'accepted']),
    ).toBe('tightened');
  });

  it('discontinues when 5 lots are rejected on tightened inspection (§9.4)', () => {
    const mixed: LotOutcome[] = [
      'rejected',
      'accepted',
      'rejected',
      'rejected',
      'accepted',
      'accepted',
      'rejected',
      'rejected',
    ];
    expect(nextSeverity('tightened', mixed)).toBe('discontinued');
    expect(nextSeverity('tightened', [...mixed, ...times(5, 'accepted')])).toBe('discontinued');
    expect(nextSeverity('tightened', [...times(4, 'rejected'), ...times(5, 'accepted')])).toBe(
      'normal',
    );
  });

  it('keeps normal without nonconforming counts, however many lots are accepted', () => {
    expect(nextSeverity('normal', times(40, 'accepted'))).toBe('normal');
  });

  it('reduces after 10 accepted lots when each would pass one AQL step tighter (switching score 30, §9.3.3)', () => {
    // H at AQL 2.5 is 3/4; one step tighter (1.5) H is 2/3, so up to 2 nonconforming add 3.
    expect(nextSeverity('normal', times(10, 'accepted'), lots(Array(10).fill(2), 'H', 2.5))).toBe(
      'reduced',
    );
    expect(nextSeverity('normal', times(9, 'accepted'), lots(Array(9).fill(2), 'H', 2.5))).toBe(
      'normal',
    );
    // A lot with 3 nonconforming is accepted but resets the score.
    const counts = [0, 0, 0, 0, 0, 3, 0, 0, 0, 0, 0];
    expect(nextSeverity('normal', times(11, 'accepted'), lots(counts, 'H', 2.5))).toBe('normal');
    expect(
      nextSeverity('normal', times(15, 'accepted'), lots([...counts, 0, 0, 0, 0], 'H', 2.5)),
    ).toBe('normal');
    expect(
      nextSeverity('normal', times(16, 'accepted'), lots([...counts, 0, 0, 0, 0, 0], 'H', 2.5)),
    ).toBe('reduced');
  });

  it('adds 2 per accepted lot for plans with Ac 0 or 1, so 15 lots are needed', () => {
    // F at AQL 0.65 is 0/1.
    expect(nextSeverity('normal', times(14, 'accepted'), lots(Array(14).fill(0), 'F', 0.65))).toBe(
      'normal',
    );
    expect(nextSeverity('normal', times(15, 'accepted'), lots(Array(15).fill(0), 'F', 0.65))).toBe(
      'reduced',
    );
  });

  it('returns from reduced to normal on a rejection, or an acceptance inside the Table II-C gap', () => {
    expect(nextSeverity('reduced', ['accepted', 'rejected'])).toBe('normal');
    expect(nextSeverity('reduced', times(30, 'accepted'))).toBe('reduced');
    // Reduced H at AQL 2.5 is n = 20, Ac 1, Re 4: two nonconforming accepts but reinstates normal.
    expect(nextSeverity('reduced', ['accepted'], lots([2], 'H', 2.5))).toBe('normal');
    expect(nextSeverity('reduced', ['accepted'], lots([1], 'H', 2.5))).toBe('reduced');
  });

  it('follows a switch part-way through the lots', () => {
    expect(nextSeverity('normal', ['rejected', 'rejected', ...times(5, 'accepted')])).toBe(
      'normal',
    );
    expect(nextSeverity('normal', ['rejected', 'rejected', ...times(4, 'accepted')])).toBe(
      'tightened',
    );
  });

  it('rejects counts that do not line up with the outcomes', () => {
    expect(() => nextSeverity('normal', ['accepted'], [])).toThrow(RangeError);
  });
});
