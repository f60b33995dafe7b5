import { z } from 'zod';
import { dayNumber, MAX_PERIOD_DAYS, TREND_METRICS } from '../network';
import { idParam, localDate } from './common';

export * from '../network';
export { localDate };

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

const metric = z.enum(TREND_METRICS, { error: 'Metric is comebacks, turnaround or revenue' });

export const shopTrendsQuery = z
  .object({ from: localDate, to: localDate, metric })
  .superRefine(checkPeriod);
export type ShopTrendsQuery = z.infer<typeof shopTrendsQuery>;

export const networkTrendsQuery = z
  .object({ from: localDate, to: localDate, region: idParam.optional(), metric })
  .superRefine(checkPeriod);
export type NetworkTrendsQuery = z.infer<typeof networkTrendsQuery>;
