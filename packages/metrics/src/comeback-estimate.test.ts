import fc from 'fast-check';
import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { comebackEstimate, comebackReference, expectedRate } from './comeback-estimate';
import { type ComebackRateJob, comebackRate } from './comebacks';
import { poissonInterval } from './poisson';
import { eventProbability, type FollowUpRow, followUpTable, kaplanMeier } from './survival';

const DAY = 86_400_000;
const W = 90;
const start = Date.UTC(2025, 0, 1);

/** Jobs collected over `days` from `from`, each coming back within W days with probability p. */
function jobs(seed: string, n: number, from: number, days: number, p: number): FollowUpRow[] {
  const random = seedrandom(seed);
  return Array.from({ length: n }, () => {
    const collected = from + Math.floor(random() * days * DAY);
    const back = random() < p ? collected + Math.floor(random() * W * DAY) : null;
    return { collectedAt: new Date(collected), comebackAt: back === null ? null : new Date(back) };
  });
}

const asRateJob = (row: FollowUpRow): ComebackRateJob => ({
  collectedAt: row.collectedAt,
  comebacks: row.comebackAt ? [{ attribution: 'workmanship', reportedAt: row.comebackAt }] : [],
});

describe('comebackEstimate', () => {
  it('equals the final comeback rate once every window has closed', () => {
    fc.assert(
      fc.property(
        fc.string(),
        fc.integer({ min: 1, max: 400 }),
        fc.double({ min: 0, max: 0.5, noNaN: true }),
        (seed, n, p) => {
          const rows = jobs(seed, n, start, 31, p);
          const asOf = new Date(start + (31 + W) * DAY + 1);
          const estimate = comebackEstimate(followUpTable(rows, { asOf, warrantyDays: W }), {
            warrantyDays: W,
          });
          const final = comebackRate(rows.map(asRateJob), { asOf, warrantyDays: W });
          expect(estimate.final).toBe(true);
          expect(estimate.method).toBe('kaplan-meier');
          expect(estimate.events).toBe(final.events);
          expect(estimate.jobs).toBe(final.trials);
          expect(estimate.probability!).toBeCloseTo(final.rate!, 12);
          expect(estimate.stillFollowed).toBe(0);
        },
      ),
      { numRuns: 100 },
    );
  });

  it('reads the long-run rate for a month whose windows are still open, where the old rate reads high', () => {
    // Reference: a year of jobs at a 5% comeback rate, all windows closed.
    const asOf = new Date(start + 365 * DAY + (W + 31) * DAY);
    const reference = comebackReference(
      followUpTable(jobs('reference', 20_000, start, 365, 0.05), { asOf, warrantyDays: W }),
      W,
    )!;
    expect(reference.probability).toBeGreaterThan(0.045);
    expect(reference.probability).toBeLessThan(0.055);
    // The month just past: collected over the 31 days before asOf, same 5%.
    const month = jobs('month', 2_000, asOf.getTime() - 31 * DAY, 31, 0.05);
    const table = followUpTable(month, { asOf, warrantyDays: W });
    const estimate = comebackEstimate(table, { warrantyDays: W, reference });
    const old = comebackRate(month.map(asRateJob), { asOf, warrantyDays: W });
    expect(old.rate).toBe(1); // every trial is a job that already came back
    expect(estimate.method).toBe('network × ratio');
    expect(estimate.final).toBe(false);
    expect(estimate.followedThrough).toBe(0);
    expect(estimate.stillFollowed).toBe(2_000 - estimate.events);
    expect(estimate.probability!).toBeGreaterThan(0.03);
    expect(estimate.probability!).toBeLessThan(0.07);
    const ratio = estimate.ratio!;
    expect(estimate.probability).toBeCloseTo(expectedRate(ratio.ratio!, reference.probability), 12);
    const counts = poissonInterval(ratio.observed);
    expect(estimate.interval!.lower).toBeCloseTo(
      (counts.lower / ratio.expected) * reference.probability,
      12,
    );
    expect(estimate.interval!.upper).toBeCloseTo(
      (counts.upper / ratio.expected) * reference.probability,
      12,
    );
  });

  it('uses the shop’s own Kaplan–Meier curve as soon as one job has been followed through', () => {
    const asOf = new Date(start + 200 * DAY);
    const rows: FollowUpRow[] = [
      { collectedAt: new Date(asOf.getTime() - 95 * DAY), comebackAt: null },
      { collectedAt: new Date(asOf.getTime() - 20 * DAY), comebackAt: null },
      {
        collectedAt: new Date(asOf.getTime() - 30 * DAY),
        comebackAt: new Date(asOf.getTime() - 25 * DAY),
      },
    ];
    const table = followUpTable(rows, { asOf, warrantyDays: W });
    const estimate = comebackEstimate(table, { warrantyDays: W });
    expect(estimate.method).toBe('kaplan-meier');
    // Ŝ = 1 − 1/3 at day 5 (three at risk), nothing more by day 90: 1/3.
    expect(estimate.probability).toBeCloseTo(1 / 3, 12);
    expect(estimate).toMatchObject({ jobs: 3, events: 1, stillFollowed: 1, followedThrough: 1 });
    expect(estimate.standardError).toBeCloseTo(
      eventProbability(kaplanMeier(table), W).standardError!,
      12,
    );
  });

  it('says when nothing can be estimated', () => {
    const asOf = new Date(start);
    const none = comebackEstimate(followUpTable([], { asOf, warrantyDays: W }), {
      warrantyDays: W,
    });
    expect(none).toMatchObject({ method: null, probability: null, final: false, jobs: 0 });
    const open = comebackEstimate(
      followUpTable([{ collectedAt: new Date(start - 3 * DAY), comebackAt: null }], {
        asOf,
        warrantyDays: W,
      }),
      { warrantyDays: W },
    );
    expect(open).toMatchObject({ method: null, probability: null, ratio: null, stillFollowed: 1 });
  });

  it('gives every job’s comeback as 100% with the exact binomial bound', () => {
    const asOf = new Date(start + 10 * DAY);
    const rows = [1, 2, 3].map((d) => ({
      collectedAt: new Date(start),
      comebackAt: new Date(start + d * DAY),
    }));
    const estimate = comebackEstimate(followUpTable(rows, { asOf, warrantyDays: W }), {
      warrantyDays: W,
    });
    expect(estimate).toMatchObject({ method: 'kaplan-meier', probability: 1, final: true });
    expect(estimate.interval!.lower).toBeCloseTo(0.025 ** (1 / 3), 12);
  });

  it('refuses a reference built for another window', () => {
    const asOf = new Date(start + 400 * DAY);
    const reference = comebackReference(
      followUpTable(jobs('r', 100, start, 100, 0.1), { asOf, warrantyDays: 60 }),
      60,
    );
    expect(() =>
      comebackEstimate(followUpTable([], { asOf, warrantyDays: W }), {
        warrantyDays: W,
        reference,
      }),
    ).toThrow(RangeError);
    expect(comebackReference(followUpTable([], { asOf, warrantyDays: W }), W)).toBeNull();
  });
});
