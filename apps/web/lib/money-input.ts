// What the shop forms accept for money and rates, turned into the API's whole numbers.

/** "68", "68.5" or "68.50" → 6850 cents; anything else → null. */
export function centsFromText(text: string): number | null {
  const m = /^\s*(\d{1,6})(?:[.,](\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

/** "6" or "6.25" (per cent) → 600 or 625 basis points; anything else → null. */
export function basisPointsFromText(text: string): number | null {
  const m = /^\s*(\d{1,3})(?:[.,](\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  const bp = Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
  return bp <= 10_000 ? bp : null;
}

export const centsText = (cents: number) => (cents / 100).toFixed(2);
export const percentText = (bp: number) => String(bp / 100);
