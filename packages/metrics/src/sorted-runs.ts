import type { TurnaroundSummary } from './turnaround';

// Quantiles of the union of ascending lists of fixed-width decimal numbers, as the database keeps
// each shop-month's turnarounds (migration 0003 of @reelwright/db), merged without sorting.

/** Digits per value in the lists (shop_month_figures' turnaround lists). */
export const TURNAROUND_DIGITS = 7;

/** The i-th value of a list of fixed-width decimal numbers. */
function valueAt(list: string, i: number): number {
  let v = 0;
  for (let k = i * TURNAROUND_DIGITS, end = k + TURNAROUND_DIGITS; k < end; k++) {
    v = v * 10 + list.charCodeAt(k) - 48;
  }
  return v;
}

/** How many values of an ascending list are below `value` (binary search). */
function countBelow(list: string, value: number): number {
  let lo = 0;
  let hi = list.length / TURNAROUND_DIGITS;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (valueAt(list, mid) < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The values at ranks `lo` and `lo + 1` (0-based, ascending; the second clamped to the last) of
 * the union of ascending runs. Every value below a guess ranks below every other, so the merge
 * starts where the guess falls in each run (found by binary search) and only the few steps from
 * there to the rank are merged one by one. The guess is the value a little below the rank's
 * proportional place in the longest run, lowered while too many values lie below it.
 */
function pairAt(runs: readonly string[], count: number, lo: number): [number, number] {
  const r = runs.length;
  const lengths = Int32Array.from(runs, (run) => run.length / TURNAROUND_DIGITS);
  let longest = 0;
  for (let i = 1; i < r; i++) if (lengths[i]! > lengths[longest]!) longest = i;
  // A little below the proportional place, then lower until no more than `lo` values lie below.
  let place =
    Math.floor((lo * lengths[longest]!) / count) - Math.ceil(2 * Math.sqrt(lengths[longest]!));
  let pos = new Int32Array(r);
  let rank = 0;
  while (place > 0) {
    const guess = valueAt(runs[longest]!, place);
    const below = Int32Array.from(runs, (run) => countBelow(run, guess));
    const total = below.reduce((a, b) => a + b, 0);
    if (total <= lo) {
      pos = below;
      rank = total;
      break;
    }
    place = Math.floor(place / 2);
  }
  const heads = Float64Array.from(runs, (run, i) =>
    pos[i]! < lengths[i]! ? valueAt(run, pos[i]!) : Infinity,
  );
  let below = Infinity;
  for (; ; rank++) {
    let best = 0;
    for (let i = 1; i < r; i++) if (heads[i]! < heads[best]!) best = i;
    const value = heads[best]!;
    if (value === Infinity) return [below, below];
    if (rank === lo) below = value;
    else if (rank === lo + 1) return [below, value];
    const at = ++pos[best]!;
    heads[best] = at < lengths[best]! ? valueAt(runs[best]!, at) : Infinity;
  }
}

/**
 * Median and 90th percentile, Hyndman & Fan (1996) type 7 like `turnaroundSummary` of
 * @reelwright/metrics, of the union of ascending runs of turnaround minutes as the monthly
 * figures keep them (each run 7 digits per value; runs separated by "|"). Only the four values the
 * two quantiles need are read, each where it stands, so a period of a few months costs a
 * fraction of parsing and sorting all of them.
 */
export function summariseSortedRuns(joined: string | null): TurnaroundSummary {
  const runs = joined ? joined.split('|').filter((r) => r.length > 0) : [];
  const count = runs.reduce((n, r) => n + r.length / TURNAROUND_DIGITS, 0);
  if (count === 0) return { count: 0, median: null, p90: null };
  // Type 7: h = (n − 1)p, Q = x[⌊h⌋] + (h − ⌊h⌋)(x[⌊h⌋ + 1] − x[⌊h⌋]).
  const [median, p90] = [0.5, 0.9].map((p) => {
    const h = (count - 1) * p;
    const lo = Math.floor(h);
    const [below, above] = pairAt(runs, count, lo);
    return below + (h - lo) * (above - below);
  }) as [number, number];
  return { count, median, p90 };
}
