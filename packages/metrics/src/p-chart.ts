export interface PChartLimits {
  center: number;
  lower: number;
  upper: number;
}

/**
 * Shewhart p-chart limits: p̄ ± 3√(p̄(1 − p̄)/n), Montgomery "Introduction to Statistical
 * Quality Control", §7.2 (fraction nonconforming control chart); NIST/SEMATECH e-Handbook
 * §6.3.3.2. The lower limit is clamped at 0 and the upper at 1.
 *
 * Throws RangeError when the centre rate is outside [0, 1] or trials is not a positive number.
 */
export function pChartLimits(centerRate: number, trials: number): PChartLimits {
  if (!(centerRate >= 0 && centerRate <= 1)) {
    throw new RangeError(`centerRate must be in [0, 1], got ${centerRate}`);
  }
  if (!(trials > 0) || !Number.isFinite(trials)) {
    throw new RangeError(`trials must be positive, got ${trials}`);
  }
  const sigma = Math.sqrt((centerRate * (1 - centerRate)) / trials);
  return {
    center: centerRate,
    lower: Math.max(0, centerRate - 3 * sigma),
    upper: Math.min(1, centerRate + 3 * sigma),
  };
}

export interface PChartPoint {
  label: string;
  events: number;
  trials: number;
}

export interface PChartRow extends PChartPoint {
  rate: number | null;
  lower: number | null;
  upper: number | null;
  /** 'above' or 'below' the 3-sigma limits; null inside them or with no trials. */
  signal: 'above' | 'below' | null;
}

export interface PChart {
  center: number | null;
  points: PChartRow[];
}

/**
 * A p-chart over periods (e.g. months): centre p̄ = Σ events / Σ trials over all points, and
 * per point its own limits for its own n (variable-width limits, Montgomery §7.2.2). Points
 * with no trials carry null rate and limits; no trials at all gives a null centre.
 */
export function pChart(points: readonly PChartPoint[]): PChart {
  let events = 0;
  let trials = 0;
  for (const p of points) {
    events += p.events;
    trials += p.trials;
  }
  const center = trials === 0 ? null : events / trials;
  return {
    center,
    points: points.map((p) => {
      if (center === null || p.trials === 0) {
        return { ...p, rate: null, lower: null, upper: null, signal: null };
      }
      const limits = pChartLimits(center, p.trials);
      const rate = p.events / p.trials;
      const signal = rate > limits.upper ? 'above' : rate < limits.lower ? 'below' : null;
      return { ...p, rate, lower: limits.lower, upper: limits.upper, signal };
    }),
  };
}
