import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  eventProbability,
  expectedEvents,
  type FollowUp,
  followUp,
  followUpTable,
  hazardAt,
  kaplanMeier,
  mergeSurvivalTables,
  nelsonAalen,
  survivalAt,
  survivalTable,
  tableTotals,
} from './survival';

// Freireich et al. (1963), Blood 21:699–716: remission times in weeks of the 6-MP group
// (n = 21, "+" censored), as printed in Klein & Moeschberger, "Survival Analysis" (2nd ed.,
// 2003), §1.2 and Example 4.1, and in Kleinbaum & Klein, "Survival Analysis" (3rd ed.), ch. 2.
const SIX_MP = '6,6,6,6+,7,9+,10,10+,11+,13,16,17+,19+,20+,22,23,25+,32+,32+,34+,35+';
const sixMp: FollowUp[] = SIX_MP.split(',').map((s) => ({
  time: Number.parseFloat(s),
  event: !s.endsWith('+'),
}));

const HOUR = 3_600_000;
const DAY = 24 * HOUR;
const at = (iso: string): Date => new Date(iso);

describe('Kaplan–Meier on the 6-MP remission times', () => {
  it('gives the textbook product-limit estimates and Greenwood standard errors', () => {
    // Klein & Moeschberger (2003) Table 4.1A, Ŝ(t) and its Greenwood standard error, to three
    // places (from memory; recomputed by hand below): at t = 6 Ŝ = 18/21, SE = Ŝ√(3/(21·18)).
    const printed: [number, number, number, number][] = [
      // t, at risk, Ŝ(t), SE
      [6, 21, 0.857, 0.076],
      [7, 17, 0.807, 0.087],
      [10, 15, 0.753, 0.096],
      [13, 12, 0.69, 0.107],
      [16, 11, 0.627, 0.114],
      [22, 7, 0.538, 0.128],
      [23, 6, 0.448, 0.135],
    ];
    const curve = kaplanMeier(survivalTable(sixMp));
    for (const [t, atRisk, s, se] of printed) {
      const i = curve.time.indexOf(t);
      expect(curve.atRisk[i], `at risk at ${t}`).toBe(atRisk);
      expect(curve.survival[i]!, `Ŝ(${t})`).toBeCloseTo(s, 3);
      const p = eventProbability(curve, t);
      expect(p.standardError!, `SE at ${t}`).toBeCloseTo(se, 3);
      expect(p.probability!).toBeCloseTo(1 - s, 3);
    }
    // Kleinbaum & Klein ch. 2 print Ŝ to four places: 0.8571, 0.8067, 0.7529, 0.6902, 0.6275,
    // 0.5378, 0.4482 (from memory; exactly 18/21, ×16/17, ×14/15, ×11/12, ×10/11, ×6/7, ×5/6).
    expect(survivalAt(curve, 23)).toBeCloseTo(
      (18 / 21) * (16 / 17) * (14 / 15) * (11 / 12) * (10 / 11) * (6 / 7) * (5 / 6),
      12,
    );
    expect(survivalAt(curve, 23)).toBeCloseTo(0.4482, 4);
    expect(survivalAt(curve, 5.9)).toBe(1);
    expect(survivalAt(curve, 35)).toBeCloseTo(0.4482, 4);
    expect(survivalAt(curve, 36)).toBeNull(); // past the longest follow-up
  });

  it('gives the log–log interval of Kalbfleisch & Prentice, checked by hand at t = 6', () => {
    // Ŝ = 6/7, V = 3/(21·18) = 0.0079365, σ = √V/|ln Ŝ| = 0.089087/0.154151 = 0.57792,
    // zσ = 1.13271; Ŝ^e^(zσ) = Ŝ^3.10410 = 0.61972, Ŝ^e^(−zσ) = Ŝ^0.32216 = 0.95155, so the
    // probability of relapse by week 6 is 0.1429 in (0.0484, 0.3803).
    const p = eventProbability(kaplanMeier(survivalTable(sixMp)), 6);
    expect(p.probability!).toBeCloseTo(1 / 7, 12);
    expect(p.interval!.lower).toBeCloseTo(0.04845, 4);
    expect(p.interval!.upper).toBeCloseTo(0.38028, 4);
    expect(p.atRisk).toBe(21);
  });
});

describe('Nelson–Aalen on the 6-MP remission times', () => {
  it('gives the textbook cumulative hazard and its standard error', () => {
    // Klein & Moeschberger (2003) Table 4.2 (from memory), checked by hand: Ĥ = 3/21, +1/17,
    // +1/15, +1/12, +1/11, +1/7, +1/6; SE = √(Σ d/n²): 3/441, +1/289, +1/225, +1/144, …
    const printed: [number, number, number][] = [
      [6, 0.1429, 0.0825],
      [7, 0.2017, 0.1013],
      [10, 0.2683, 0.1213],
      [13, 0.3517, 0.1471],
      [16, 0.4426, 0.173],
      [22, 0.5854, 0.2243],
      [23, 0.7521, 0.2795],
    ];
    const h = nelsonAalen(survivalTable(sixMp));
    expect(h.time).toEqual(printed.map(([t]) => t));
    printed.forEach(([t, cum, se], i) => {
      expect(hazardAt(h, t), `Ĥ(${t})`).toBeCloseTo(cum, 4);
      expect(Math.sqrt(h.variance[i]!), `SE at ${t}`).toBeCloseTo(se, 4);
    });
    expect(hazardAt(h, 5)).toBe(0);
    expect(hazardAt(h, 12.5)).toBeCloseTo(0.2683, 4); // a right-continuous step
    expect(hazardAt(h, 100)).toBeCloseTo(0.7521, 4); // held after the last event
    expect(h.lastTime).toBe(35);
  });

  it('expected events are the sum of each observation’s hazard at its own time', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ time: fc.integer({ min: 0, max: 30 }), event: fc.boolean() }), {
          minLength: 1,
          maxLength: 80,
        }),
        fc.array(fc.record({ time: fc.integer({ min: 0, max: 40 }), event: fc.boolean() }), {
          maxLength: 60,
        }),
        (reference, shop) => {
          const h = nelsonAalen(survivalTable(reference));
          const sum = shop.reduce((s, p) => s + hazardAt(h, p.time), 0);
          expect(expectedEvents(survivalTable(shop), h)).toBeCloseTo(sum, 9);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('follow-up in whole days', () => {
  const W = { asOf: at('2026-12-02T12:00:00Z'), warrantyDays: 90 };

  it('censors at the whole days watched, capped at the window', () => {
    expect(followUp({ collectedAt: at('2026-12-02T00:00:00Z'), comebackAt: null }, W)).toEqual({
      time: 0,
      event: false,
    });
    expect(followUp({ collectedAt: at('2026-11-20T13:00:00Z'), comebackAt: null }, W)).toEqual({
      time: 11, // 11 days 23 hours
      event: false,
    });
    expect(followUp({ collectedAt: at('2026-01-05T00:00:00Z'), comebackAt: null }, W)).toEqual({
      time: 90,
      event: false,
    });
    expect(followUp({ collectedAt: at('2026-12-02T12:00:01Z'), comebackAt: null }, W)).toBeNull();
  });

  it('counts a comeback on day d as an event at d + 1 once that day has been watched', () => {
    const collectedAt = at('2026-11-01T12:00:00Z');
    const cb = (iso: string) => followUp({ collectedAt, comebackAt: at(iso) }, W);
    expect(cb('2026-11-01T12:00:00Z')).toEqual({ time: 1, event: true }); // day 0
    expect(cb('2026-11-04T11:59:59Z')).toEqual({ time: 3, event: true }); // 2 days 23:59:59
    // Today's comeback on a job collected 31 days ago counts from tomorrow, the day complete.
    const late = followUp(
      { collectedAt: at('2026-11-01T18:00:00Z'), comebackAt: at('2026-12-02T09:00:00Z') },
      W,
    );
    expect(late).toEqual({ time: 30, event: false });
    expect(
      followUp(
        { collectedAt: at('2026-11-01T18:00:00Z'), comebackAt: at('2026-12-02T09:00:00Z') },
        { ...W, asOf: at('2026-12-02T18:00:00Z') },
      ),
    ).toEqual({ time: 31, event: true });
  });

  it('keeps the window half-open and ignores comebacks outside it or after asOf', () => {
    const collectedAt = at('2026-01-01T00:00:00Z');
    const end = new Date(collectedAt.getTime() + 90 * DAY);
    expect(followUp({ collectedAt, comebackAt: new Date(end.getTime() - 1) }, W)).toEqual({
      time: 90,
      event: true,
    });
    expect(followUp({ collectedAt, comebackAt: end }, W)).toEqual({ time: 90, event: false });
    expect(followUp({ collectedAt, comebackAt: at('2025-12-31T00:00:00Z') }, W)).toEqual({
      time: 90,
      event: false,
    });
    const recent = at('2026-11-20T00:00:00Z');
    expect(followUp({ collectedAt: recent, comebackAt: at('2026-12-03T00:00:00Z') }, W)).toEqual({
      time: 12,
      event: false,
    });
  });

  it('tables the same follow-up as the rows, one entry per day, and merges tables', () => {
    const asOf = at('2026-12-02T12:00:00Z');
    const rows = fc
      .sample(
        fc.record({
          collected: fc.integer({ min: 0, max: 200 * DAY }),
          back: fc.option(fc.integer({ min: -DAY, max: 100 * DAY })),
        }),
        { numRuns: 500, seed: 13 },
      )
      .map(({ collected, back }) => {
        const collectedAt = new Date(asOf.getTime() - collected + DAY);
        return {
          collectedAt,
          comebackAt: back === null ? null : new Date(collectedAt.getTime() + back),
        };
      });
    const table = followUpTable(rows, { asOf, warrantyDays: 90 });
    expect(table.time).toHaveLength(91);
    const pairs = rows.flatMap((r) => followUp(r, { asOf, warrantyDays: 90 }) ?? []);
    expect(kaplanMeier(table)).toEqual(kaplanMeier(survivalTable(pairs)));
    const halves = mergeSurvivalTables([
      followUpTable(rows.slice(0, 200), { asOf, warrantyDays: 90 }),
      followUpTable(rows.slice(200), { asOf, warrantyDays: 90 }),
    ]);
    expect(halves).toEqual(table);
    expect(tableTotals(table, 90).jobs).toBe(pairs.length);
  });
});

const pairsArb = (maxTime: number) =>
  fc.array(fc.record({ time: fc.integer({ min: 0, max: maxTime }), event: fc.boolean() }), {
    minLength: 1,
    maxLength: 120,
  });

describe('Kaplan–Meier properties', () => {
  it('equals the simple proportion when nobody is censored before the horizon', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 1, max: 90 }), { maxLength: 100 }),
        fc.integer({ min: 1, max: 200 }),
        (eventTimes, survivors) => {
          const pairs = [
            ...eventTimes.map((time) => ({ time, event: true })),
            ...Array.from({ length: survivors }, () => ({ time: 90, event: false })),
          ];
          const p = eventProbability(kaplanMeier(survivalTable(pairs)), 90);
          expect(p.probability!).toBeCloseTo(eventTimes.length / pairs.length, 12);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('never rises when follow-up is added without events', () => {
    fc.assert(
      fc.property(
        pairsArb(90),
        fc.nat(),
        fc.integer({ min: 1, max: 90 }),
        fc.boolean(),
        (pairs, pick, extra, addJob) => {
          const before = eventProbability(kaplanMeier(survivalTable(pairs)), 90).probability;
          const longer = pairs.map((p) => ({ ...p }));
          const censored = longer.filter((p) => !p.event);
          if (addJob || censored.length === 0)
            longer.push({ time: Math.min(90, extra), event: false });
          else
            censored[pick % censored.length]!.time = Math.min(
              90,
              censored[pick % censored.length]!.time + extra,
            );
          const after = eventProbability(kaplanMeier(survivalTable(longer)), 90).probability;
          if (before !== null && after !== null) expect(after).toBeLessThanOrEqual(before + 1e-12);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('keeps the estimate inside its interval and the interval inside [0, 1]', () => {
    fc.assert(
      fc.property(pairsArb(90), fc.integer({ min: 0, max: 95 }), (pairs, t) => {
        const p = eventProbability(kaplanMeier(survivalTable(pairs)), t);
        if (p.probability === null) return;
        expect(p.interval!.lower).toBeGreaterThanOrEqual(0);
        expect(p.interval!.upper).toBeLessThanOrEqual(1);
        expect(p.interval!.lower).toBeLessThanOrEqual(p.probability + 1e-12);
        expect(p.interval!.upper).toBeGreaterThanOrEqual(p.probability - 1e-12);
      }),
      { numRuns: 500 },
    );
  });
});

describe('Kaplan–Meier edge cases', () => {
  it('no jobs: not reached', () => {
    const p = eventProbability(kaplanMeier(survivalTable([])), 90);
    expect(p).toEqual({
      probability: null,
      standardError: null,
      interval: null,
      atRisk: 0,
      reached: false,
    });
  });

  it('nobody followed to the horizon: not reached', () => {
    const p = eventProbability(
      kaplanMeier(
        survivalTable([
          { time: 3, event: true },
          { time: 20, event: false },
        ]),
      ),
      90,
    );
    expect(p.reached).toBe(false);
    expect(p.probability).toBeNull();
  });

  it('no events: 0 with the exact binomial upper bound on those followed through', () => {
    // Clopper–Pearson for 0 of 10: 1 − 0.025^(1/10) = 0.3085.
    const pairs = [
      ...Array.from({ length: 10 }, () => ({ time: 90, event: false })),
      { time: 40, event: false },
    ];
    const p = eventProbability(kaplanMeier(survivalTable(pairs)), 90);
    expect(p.probability).toBe(0);
    expect(p.standardError).toBe(0);
    expect(p.interval!.lower).toBe(0);
    expect(p.interval!.upper).toBeCloseTo(0.3085, 4);
  });

  it('all events: 1 with the exact binomial lower bound', () => {
    // Clopper–Pearson for 5 of 5: 0.025^(1/5) = 0.4782.
    const pairs = [1, 2, 2, 30, 89].map((time) => ({ time, event: true }));
    const p = eventProbability(kaplanMeier(survivalTable(pairs)), 90);
    expect(p.probability).toBe(1);
    expect(p.standardError).toBeNull();
    expect(p.interval!.lower).toBeCloseTo(0.4782, 4);
    expect(p.interval!.upper).toBe(1);
  });
});
