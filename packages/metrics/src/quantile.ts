/**
 * Sample quantile, Hyndman & Fan (1996) "Sample quantiles in statistical packages",
 * The American Statistician 50(4):361–365, definition 7 (the default of R and NumPy):
 * with the values sorted ascending as x[0..n-1], h = (n - 1)p and
 * Q(p) = x[⌊h⌋] + (h - ⌊h⌋)(x[⌊h⌋ + 1] - x[⌊h⌋]).
 *
 * The input is not modified. Throws RangeError on empty input, a NaN value, or p outside [0, 1].
 */
export function quantile(values: readonly number[], p: number): number {
  if (values.length === 0) throw new RangeError('quantile of an empty list');
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantile probability must be in [0, 1], got ${p}`);
  const sorted = Float64Array.from(values);
  if (sorted.some(Number.isNaN)) throw new RangeError('quantile of a list containing NaN');
  sorted.sort();
  return quantileOfSorted(sorted, p);
}

/** Type 7 quantile of values already sorted ascending (no checks beyond the probability). */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  if (sorted.length === 0) throw new RangeError('quantile of an empty list');
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantile probability must be in [0, 1], got ${p}`);
  return quantileOfSorted(sorted, p);
}

function quantileOfSorted(sorted: ArrayLike<number>, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const below = sorted[lo]!;
  if (lo === h) return below;
  const above = sorted[lo + 1]!;
  return below + (h - lo) * (above - below);
}
