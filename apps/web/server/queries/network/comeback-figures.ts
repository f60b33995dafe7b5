import {
  comebackEstimate,
  compareRatios,
  compareShops,
  standardizedRatio,
  type ComebackEstimate,
  type ComebackReference,
  type RatioComparison,
  type ShopComparison,
  type SurvivalTable,
} from '@reelwright/metrics';
import { addInto, emptyTable } from './follow-up';
import type {
  ComebackComparison,
  ComebackEstimateFigures,
  ComebackFigures,
  NetworkTotals,
  RatioFigures,
} from './types';

/** What the aggregate counted per shop for the comeback rate (final-rate definition). */
export interface ComebackCounts {
  shopId: number;
  collected: number;
  trials: number;
  events: number;
  awaitingReview: number;
}

function estimateFigures(e: ComebackEstimate): ComebackEstimateFigures {
  return {
    method: e.method,
    probability: e.probability,
    interval: e.interval,
    final: e.final,
    jobs: e.jobs,
    events: e.events,
    stillFollowed: e.stillFollowed,
    followedThrough: e.followedThrough,
  };
}

function ratioFigures(r: RatioComparison): RatioFigures {
  return {
    observed: r.observed,
    expected: r.expected,
    ratio: r.ratio,
    interval: r.interval,
    funnel95: r.funnel95,
    funnel998: r.funnel998,
    band: r.band,
    side: r.side,
    note: r.note,
  };
}

const scaled = (i: { lower: number; upper: number } | null, p: number) =>
  i ? { lower: Math.min(1, i.lower * p), upper: Math.min(1, i.upper * p) } : { lower: 0, upper: 1 };

/**
 * Every shop's comeback figures from its follow-up table. A final period (every window closed)
 * keeps the binomial comparison of final rates with the pooled network rate, and its
 * Kaplan–Meier estimate is that final rate. A period with windows open is compared by O/E
 * against the network reference on Spiegelhalter's Poisson funnel (`compareRatios`, which gives a
 * band only where the ratio's own exact interval supports it); rate and interval are then the
 * estimate's, and the funnel limits on the rate scale are the ratio's times the reference's
 * W-day probability (the rate a shop on the line would be expected to reach). Without a
 * reference an open period still gets its estimate, but no band.
 */
export function comebackFigures(
  counts: readonly ComebackCounts[],
  tables: ReadonlyMap<string, SurvivalTable>,
  options: { warrantyDays: number; final: boolean; reference: ComebackReference | null },
): ComebackFigures[] {
  const w = options.warrantyDays;
  const comparison: ComebackComparison = options.final ? 'binomial' : 'ratio';
  const reference = comparison === 'ratio' ? options.reference : null;
  const estimates = counts.map((c) =>
    comebackEstimate(tables.get(String(c.shopId)) ?? emptyTable(w), { warrantyDays: w, reference }),
  );
  const binomial = compareShops(
    counts.map((c) => ({ shopId: String(c.shopId), events: c.events, trials: c.trials })),
  );
  const ratios = reference
    ? compareRatios(
        estimates.map((e, i) => ({
          shopId: String(counts[i]!.shopId),
          observed: e.events,
          expected: e.ratio?.expected ?? 0,
        })),
      )
    : null;
  return counts.map((c, i): ComebackFigures => {
    const e = estimates[i]!;
    const b: ShopComparison = binomial.shops[i]!;
    const base = {
      collected: c.collected,
      censored: c.collected - c.trials,
      awaitingReview: c.awaitingReview,
      estimate: estimateFigures(e),
    };
    const r = ratios?.[i] ?? null;
    if (comparison === 'binomial') {
      const net = binomial.networkRate;
      return {
        ...base,
        comparison: 'binomial',
        ratio: null,
        events: b.events,
        trials: b.trials,
        rate: b.rate,
        interval: b.interval,
        funnel95: b.funnel95,
        funnel998: b.funnel998,
        band: b.trials === 0 ? null : b.band,
        side:
          b.rate === null || net === null
            ? null
            : b.rate > net
              ? 'above'
              : b.rate < net
                ? 'below'
                : 'equal',
      };
    }
    // Without a reference (no network job followed through the window before the period) the
    // estimate stands alone and nothing is judged.
    const p = reference?.probability ?? 1;
    return {
      ...base,
      comparison: 'ratio',
      ratio: r && ratioFigures(r),
      events: e.events,
      trials: e.jobs,
      rate: e.probability,
      interval: e.interval,
      funnel95: scaled(r?.funnel95 ?? null, p),
      funnel998: scaled(r?.funnel998 ?? null, p),
      band: e.jobs === 0 || !r ? null : r.band,
      side:
        r === null || r.ratio === null
          ? null
          : r.side === 'high' || r.ratio > 1
            ? 'above'
            : r.side === 'low' || r.ratio < 1
              ? 'below'
              : 'equal',
    };
  });
}

/** The comeback totals of a set of shops: their tables merged, estimated as one. */
export function comebackTotals(
  shopIds: readonly number[],
  figures: readonly ComebackFigures[],
  tables: ReadonlyMap<string, SurvivalTable>,
  options: { warrantyDays: number; final: boolean; reference: ComebackReference | null },
): NetworkTotals['comebacks'] {
  const w = options.warrantyDays;
  const merged = emptyTable(w);
  for (const id of shopIds) {
    const t = tables.get(String(id));
    if (t) addInto(merged, t);
  }
  const comparison: ComebackComparison = options.final ? 'binomial' : 'ratio';
  const reference = comparison === 'ratio' ? options.reference : null;
  const e = comebackEstimate(merged, { warrantyDays: w, reference });
  const sum = (pick: (f: ComebackFigures) => number) => figures.reduce((t, f) => t + pick(f), 0);
  const events = sum((f) => (f.comparison === 'ratio' ? 0 : f.events));
  const trials = sum((f) => (f.comparison === 'ratio' ? 0 : f.trials));
  const observed = sum((f) => f.ratio?.observed ?? 0);
  const expected = sum((f) => f.ratio?.expected ?? 0);
  const ratio = reference ? standardizedRatio(observed, expected) : null;
  return {
    events: comparison === 'ratio' ? e.events : events,
    trials: comparison === 'ratio' ? e.jobs : trials,
    collected: sum((f) => f.collected),
    censored: sum((f) => f.censored),
    rate: comparison === 'ratio' ? e.probability : trials === 0 ? null : events / trials,
    comparison,
    estimate: estimateFigures(e),
    ratio: ratio && {
      observed: ratio.observed,
      expected: ratio.expected,
      ratio: ratio.ratio,
      interval: ratio.interval,
    },
  };
}
