import { z } from 'zod';
import { idParam, isCalendarDate, localDate } from './common';

export { localDate };

/** Longest period the comparison accepts: five years of local dates. */
export const MAX_PERIOD_DAYS = 1_830;

const DAY = 86_400_000;

/** Day number of a "YYYY-MM-DD" civil date, or null when it is not a real calendar date. */
export function dayNumber(date: string): number | null {
  if (!isCalendarDate(date)) return null;
  return Date.parse(`${date}T00:00:00Z`) / DAY;
}

function checkPeriod(value: { from: string; to: string }, ctx: z.RefinementCtx) {
  const a = dayNumber(value.from);
  const b = dayNumber(value.to);
  if (a === null || b === null) return;
  if (b < a) ctx.addIssue({ code: 'custom', path: ['to'], message: 'Must be on or after from' });
  else if (b - a + 1 > MAX_PERIOD_DAYS)
    ctx.addIssue({ code: 'custom', path: ['to'], message: 'A period can span at most five years' });
}

/** A period of local dates, both inclusive; each shop reads it in its own time zone. */
export const periodQuery = z.object({ from: localDate, to: localDate }).superRefine(checkPeriod);
export type PeriodQuery = z.infer<typeof periodQuery>;

/** `GET /api/network/comparison` and `GET /api/network/trends` (with `metric`). */
export const comparisonQuery = z
  .object({ from: localDate, to: localDate, region: idParam.optional() })
  .superRefine(checkPeriod);
export type ComparisonQuery = z.infer<typeof comparisonQuery>;

export const TREND_METRICS = ['comebacks', 'turnaround', 'revenue'] as const;
export type TrendMetric = (typeof TREND_METRICS)[number];
const metric = z.enum(TREND_METRICS, { error: 'Metric is comebacks, turnaround or revenue' });

export const shopTrendsQuery = z
  .object({ from: localDate, to: localDate, metric })
  .superRefine(checkPeriod);
export type ShopTrendsQuery = z.infer<typeof shopTrendsQuery>;

export const networkTrendsQuery = z
  .object({ from: localDate, to: localDate, region: idParam.optional(), metric })
  .superRefine(checkPeriod);
export type NetworkTrendsQuery = z.infer<typeof networkTrendsQuery>;

/** How turnaround is shown: business hours, or business days of the shop's average open day. */
export const TURNAROUND_UNITS = ['hours', 'days'] as const;
export type TurnaroundUnit = (typeof TURNAROUND_UNITS)[number];
