// The network view's periods, metrics and units, free of zod, so that pages in the browser can use
// them; lib/validators/network.ts builds the request schemas from them.
import { isCalendarDate } from './dates';

/** Longest period the comparison accepts: five years of local dates. */
export const MAX_PERIOD_DAYS = 1_830;

const DAY = 86_400_000;

/** Day number of a "YYYY-MM-DD" civil date, or null when it is not a real calendar date. */
export function dayNumber(date: string): number | null {
  if (!isCalendarDate(date)) return null;
  return Date.parse(`${date}T00:00:00Z`) / DAY;
}

export const TREND_METRICS = ['comebacks', 'turnaround', 'revenue'] as const;
export type TrendMetric = (typeof TREND_METRICS)[number];

/** How turnaround is shown: business hours, or business days of the shop's average open day. */
export const TURNAROUND_UNITS = ['hours', 'days'] as const;
export type TurnaroundUnit = (typeof TURNAROUND_UNITS)[number];
