/** A calendar month "YYYY-MM", taken in each shop's own time zone. */
export type Month = `${number}-${number}`;

export const MONTH_PATTERN = /^(\d{4})-(0[1-9]|1[0-2])$/;

export function parseMonth(month: string): { year: number; month: number } {
  const m = MONTH_PATTERN.exec(month);
  if (!m) throw new RangeError(`Expected "YYYY-MM", got "${month}"`);
  return { year: Number(m[1]), month: Number(m[2]) };
}

const pad = (n: number) => String(n).padStart(2, '0');

/** Local dates bounding the month: the first day, the last day (inclusive) and the next month's first. */
export function monthDates(month: string) {
  const { year, month: m } = parseMonth(month);
  const next = m === 12 ? { year: year + 1, month: 1 } : { year, month: m + 1 };
  const lastDay = new Date(Date.UTC(year, m, 0)).getUTCDate();
  return {
    first: `${year}-${pad(m)}-01`,
    last: `${year}-${pad(m)}-${pad(lastDay)}`,
    nextFirst: `${next.year}-${pad(next.month)}-01`,
  };
}

export function shiftMonth(month: string, by: number): string {
  const { year, month: m } = parseMonth(month);
  const index = year * 12 + (m - 1) + by;
  return `${Math.floor(index / 12)}-${pad((index % 12) + 1)}`;
}

/** "November 2026". */
export function monthLabel(month: string): string {
  const { year, month: m } = parseMonth(month);
  return new Intl.DateTimeFormat('en-US', {
    month: 'long',
    year: 'numeric',
    timeZone: 'UTC',
  }).format(new Date(Date.UTC(year, m - 1, 1)));
}

/**
 * The last month that has ended everywhere in the network (shops sit at UTC−4 to UTC−10 at most
 * in practice; a 14-hour margin covers every zone west of Greenwich).
 */
export function lastEndedMonth(now: Date): string {
  const shifted = new Date(now.getTime() - 14 * 3_600_000);
  const current = `${shifted.getUTCFullYear()}-${pad(shifted.getUTCMonth() + 1)}`;
  return shiftMonth(current, -1);
}
