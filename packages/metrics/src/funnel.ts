import { binomialCdf, binomialQuantile } from './binomial';
import { type Interval, wilsonInterval } from './intervals';

export type FairnessBand = 'in line' | 'on watch' | 'out of line';

function checkTrials(trials: number): void {
  if (!Number.isInteger(trials) || trials < 0) {
    throw new RangeError(`trials must be a non-negative integer, got ${trials}`);
  }
}

/** Spiegelhalter's interpolated binomial limit at probability q, as a proportion. */
function interpolatedLimit(q: number, n: number, theta: number): number {
  const r = binomialQuantile(q, n, theta);
  const atR = binomialCdf(r, n, theta);
  const belowR = r > 0 ? binomialCdf(r - 1, n, theta) : 0;
  const alpha = atR > belowR ? (atR - q) / (atR - belowR) : 0;
  return (r - alpha) / n;
}

/**
 * Exact binomial funnel-plot limits with interpolation, Spiegelhalter (2005) "Funnel plots for
 * comparing institutional performance", Statistics in Medicine 24:1185–1202, appendix A.1.1:
 * for target θ and volume n, r_p is the smallest r with P(R ≤ r) ≥ p, R ~ Binomial(n, θ),
 * α = (P(R ≤ r_p) − p) / (P(R ≤ r_p) − P(R ≤ r_p − 1)), and the limit is (r_p − α) / n,
 * at p = (1 − coverage)/2 for the lower and p = (1 + coverage)/2 for the upper limit.
 *
 * Limits are proportions clamped to [0, 1]; trials = 0 gives [0, 1], a target of 0 or 1 gives
 * [target, target]. For a very small expected count (nθ well below 1) the interpolated upper
 * limit can fall below θ, as the formula implies. Throws RangeError on
 * non-integer trials, a target outside [0, 1] or coverage outside (0, 1).
 */
export function funnelLimits(trials: number, targetRate: number, coverage: number): Interval {
  checkTrials(trials);
  if (!(targetRate >= 0 && targetRate <= 1)) {
    throw new RangeError(`targetRate must be in [0, 1], got ${targetRate}`);
  }
  if (!(coverage > 0 && coverage < 1)) {
    throw new RangeError(`coverage must be in (0, 1), got ${coverage}`);
  }
  if (trials === 0) return { lower: 0, upper: 1 };
  // A certain outcome has no spread; the interpolation would push one limit off the target.
  if (targetRate === 0 || targetRate === 1) return { lower: targetRate, upper: targetRate };
  const tail = (1 - coverage) / 2;
  const clamp = (x: number): number => Math.min(1, Math.max(0, x));
  return {
    lower: clamp(interpolatedLimit(tail, trials, targetRate)),
    upper: clamp(interpolatedLimit(1 - tail, trials, targetRate)),
  };
}

/**
 * Fairness band of a shop's rate events/trials against the network rate, on funnel limits for
 * its own volume (README, figures table): strictly outside the 99.8% limits is
 * "out of line", else strictly outside the 95% limits is "on watch" (high or low), else
 * "in line". No trials gives "in line".
 */
export function fairnessBand(events: number, trials: number, networkRate: number): FairnessBand {
  checkTrials(trials);
  if (!Number.isInteger(events) || events < 0 || events > trials) {
    throw new RangeError(`events must be an integer in [0, trials], got ${events}`);
  }
  if (trials === 0) return 'in line';
  const rate = events / trials;
  const outer = funnelLimits(trials, networkRate, 0.998);
  if (rate < outer.lower || rate > outer.upper) return 'out of line';
  const inner = funnelLimits(trials, networkRate, 0.95);
  if (rate < inner.lower || rate > inner.upper) return 'on watch';
  return 'in line';
}

export interface ShopCounts {
  shopId: string;
  events: number;
  trials: number;
}

export interface ShopComparison extends ShopCounts {
  rate: number | null;
  interval: Interval | null;
  funnel95: Interval;
  funnel998: Interval;
  band: FairnessBand;
}

export interface NetworkComparison {
  networkRate: number | null;
  events: number;
  trials: number;
  shops: ShopComparison[];
}

/**
 * Compares each shop's rate (comebacks, audit failures…) with the network rate: the pooled
 * Σ events / Σ trials over all shops given. Per shop: rate (null with no trials), its Wilson
 * 95% interval, the 95% and 99.8% funnel limits at its own volume, and its fairness band.
 * With no trials anywhere the network rate is null and every shop is "in line" with [0, 1]
 * limits. Shops keep their input order.
 */
export function compareShops(shops: readonly ShopCounts[]): NetworkComparison {
  let events = 0;
  let trials = 0;
  for (const s of shops) {
    checkTrials(s.trials);
    if (!Number.isInteger(s.events) || s.events < 0 || s.events > s.trials) {
      throw new RangeError(`shop ${s.shopId}: events must be an integer in [0, trials]`);
    }
    events += s.events;
    trials += s.trials;
  }
  const networkRate = trials === 0 ? null : events / trials;
  const whole: Interval = { lower: 0, upper: 1 };
  return {
    networkRate,
    events,
    trials,
    shops: shops.map((s) => {
      const funnel95 = networkRate === null ? whole : funnelLimits(s.trials, networkRate, 0.95);
      const funnel998 = networkRate === null ? whole : funnelLimits(s.trials, networkRate, 0.998);
      const rate = s.trials === 0 ? null : s.events / s.trials;
      let band: FairnessBand = 'in line';
      if (rate !== null) {
        if (rate < funnel998.lower || rate > funnel998.upper) band = 'out of line';
        else if (rate < funnel95.lower || rate > funnel95.upper) band = 'on watch';
      }
      return {
        shopId: s.shopId,
        events: s.events,
        trials: s.trials,
        rate,
        interval: wilsonInterval(s.events, s.trials),
        funnel95,
        funnel998,
        band,
      };
    }),
  };
}
