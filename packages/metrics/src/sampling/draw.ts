import seedrandom from 'seedrandom';

/**
 * Simple random sample without replacement: a partial Fisher–Yates shuffle (Durstenfeld 1964,
 * Knuth TAOCP vol. 2 Algorithm P) driven by seedrandom's ARC4 generator seeded with `seed`,
 * so the same items in the same order with the same seed always give the same sample, and
 * anyone holding the seed can redraw it.
 *
 * Returns the drawn items in drawn order; size ≥ items.length gives every item (shuffled),
 * size 0 gives []. The input is not modified. Throws RangeError when size is not a
 * non-negative integer.
 */
export function drawSample<T>(items: readonly T[], size: number, seed: string): T[] {
  if (!Number.isInteger(size) || size < 0) {
    throw new RangeError(`size must be a non-negative integer, got ${size}`);
  }
  const pool = items.slice();
  const k = Math.min(size, pool.length);
  const random = seedrandom(seed);
  for (let i = 0; i < k; i++) {
    const j = i + Math.floor(random() * (pool.length - i));
    const picked = pool[j]!;
    pool[j] = pool[i]!;
    pool[i] = picked;
  }
  return pool.slice(0, k);
}
