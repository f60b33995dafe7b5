'use client';

import { funnelLimits, type FairnessBand } from '@reelwright/metrics';
import {
  CartesianGrid,
  ComposedChart,
  LabelList,
  Line,
  ResponsiveContainer,
  Scatter,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';

export interface FunnelPoint {
  id: number;
  label: string;
  trials: number;
  rate: number;
  band: FairnessBand;
}

const BAND_STYLE: Record<
  FairnessBand,
  { colour: string; shape: 'circle' | 'triangle' | 'diamond' }
> = {
  'in line': { colour: '#475569', shape: 'circle' },
  'on watch': { colour: '#d97706', shape: 'triangle' },
  'out of line': { colour: '#a03c28', shape: 'diamond' },
};
export const FUNNEL_COLOURS = { network: '#1f514a', limit95: '#b08330', limit998: '#853223' };

const pct = (x: number) => `${(x * 100).toFixed(x < 0.1 ? 1 : 0)}%`;

/** Limit curves around the network rate at volumes spread over [lo, hi], by @reelwright/metrics. */
export function funnelCurves(networkRate: number, lo: number, hi: number, steps = 60) {
  const out: {
    n: number;
    network: number;
    lower95: number;
    upper95: number;
    lower998: number;
    upper998: number;
  }[] = [];
  const seen = new Set<number>();
  for (let k = 0; k <= steps; k++) {
    // Spread on a square-root scale: the funnel changes fastest at small volumes.
    const n = Math.max(
      1,
      Math.round((Math.sqrt(lo) + ((Math.sqrt(hi) - Math.sqrt(lo)) * k) / steps) ** 2),
    );
    if (seen.has(n)) continue;
    seen.add(n);
    const l95 = funnelLimits(n, networkRate, 0.95);
    const l998 = funnelLimits(n, networkRate, 0.998);
    out.push({
      n,
      network: networkRate,
      lower95: l95.lower,
      upper95: l95.upper,
      lower998: l998.lower,
      upper998: l998.upper,
    });
  }
  return out;
}

/**
 * Funnel plot: each shop's rate against its volume, with the network rate and the exact binomial
 * 95% and 99.8% limits as curves. Marks differ in shape as well as colour by band.
 */
export function FunnelChart(props: {
  points: FunnelPoint[];
  networkRate: number;
  xLabel: string;
  height?: number;
}) {
  const volumes = props.points.map((p) => p.trials);
  const lo = Math.max(1, Math.floor(Math.min(...volumes) * 0.6));
  const hi = Math.max(lo + 1, Math.ceil(Math.max(...volumes) * 1.12));
  const curves = funnelCurves(props.networkRate, lo, hi);
  const top = Math.min(
    1,
    Math.max(...props.points.map((p) => p.rate), curves[0]?.upper998 ?? 0, props.networkRate * 2) *
      1.1,
  );
  const byBand = (band: FairnessBand) =>
    props.points.filter((p) => p.band === band).map((p) => ({ ...p, n: p.trials }));
  return (
    <div style={{ height: props.height ?? 360 }}>
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={curves} margin={{ top: 12, right: 96, bottom: 28, left: 8 }}>
          <CartesianGrid stroke="#e9e0cd" strokeDasharray="3 3" />
          <XAxis
            dataKey="n"
            type="number"
            domain={[lo, hi]}
            tick={{ fill: '#475569', fontSize: 12 }}
            label={{
              value: props.xLabel,
              position: 'insideBottom',
              offset: -16,
              fill: '#334155',
              fontSize: 13,
            }}
          />
          <YAxis
            type="number"
            domain={[0, top]}
            tickFormatter={pct}
            tick={{ fill: '#475569', fontSize: 12 }}
            width={48}
            allowDataOverflow
          />
          <Tooltip
            formatter={(value: number, name: string) => [pct(Number(value)), name]}
            labelFormatter={(n: number) => `Volume ${n}`}
          />
          <Line
            dataKey="upper998"
            name="99.8% upper limit"
            stroke={FUNNEL_COLOURS.limit998}
            strokeWidth={1.5}
            dot={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="lower998"
            name="99.8% lower limit"
            stroke={FUNNEL_COLOURS.limit998}
            strokeWidth={1.5}
            dot={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="upper95"
            name="95% upper limit"
            stroke={FUNNEL_COLOURS.limit95}
            strokeWidth={1.5}
            strokeDasharray="5 4"
            dot={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="lower95"
            name="95% lower limit"
            stroke={FUNNEL_COLOURS.limit95}
            strokeWidth={1.5}
            strokeDasharray="5 4"
            dot={false}
            isAnimationActive={false}
          />
          <Line
            dataKey="network"
            name="Network rate"
            stroke={FUNNEL_COLOURS.network}
            strokeWidth={2}
            dot={false}
            isAnimationActive={false}
          />
          {(Object.keys(BAND_STYLE) as FairnessBand[]).map((band) => (
            <Scatter
              key={band}
              name={band}
              data={byBand(band)}
              dataKey="rate"
              fill={BAND_STYLE[band].colour}
              shape={BAND_STYLE[band].shape}
              isAnimationActive={false}
            >
              <LabelList
                dataKey="label"
                position="right"
                offset={8}
                style={{ fill: '#0f172a', fontSize: 12, fontWeight: 500 }}
              />
            </Scatter>
          ))}
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
