'use client';

import { funnelLimits, ratioFunnelLimits, type FairnessBand } from '@reelwright/metrics';
import {
  CartesianGrid,
  ComposedChart,
  LabelList,
  Line,
  ResponsiveContainer,
  Scatter,
  XAxis,
  YAxis,
} from 'recharts';
import { FUNNEL_COLOURS } from './chart-colours';
import { guideLine } from './guide-line';
import { niceTicks } from './ticks';

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

/**
 * Limit curves at volumes spread over [lo, hi], by @reelwright/metrics: exact binomial limits
 * around the network rate (volume = jobs), or, for a ratio, Spiegelhalter's Poisson limits
 * around 1 (volume = expected comebacks, not necessarily whole).
 */
export function funnelCurves(
  networkRate: number,
  lo: number,
  hi: number,
  steps = 60,
  kind: 'rate' | 'ratio' = 'rate',
) {
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
    const spread = (Math.sqrt(lo) + ((Math.sqrt(hi) - Math.sqrt(lo)) * k) / steps) ** 2;
    const n =
      kind === 'ratio' ? Math.max(0.5, Number(spread.toFixed(2))) : Math.max(1, Math.round(spread));
    if (seen.has(n)) continue;
    seen.add(n);
    const limits = (coverage: number) =>
      kind === 'ratio' ? ratioFunnelLimits(n, coverage)! : funnelLimits(n, networkRate, coverage);
    const l95 = limits(0.95);
    const l998 = limits(0.998);
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

type Place = 'right' | 'left' | 'above' | 'below';
const PLACES: Place[] = ['right', 'left', 'above', 'below'];
const OFFSET: Record<Place, { dx: number; dy: number; anchor: 'start' | 'end' | 'middle' }> = {
  right: { dx: 9, dy: 4, anchor: 'start' },
  left: { dx: -9, dy: 4, anchor: 'end' },
  above: { dx: 0, dy: -10, anchor: 'middle' },
  below: { dx: 0, dy: 18, anchor: 'middle' },
};

/**
 * Where each shop's name goes so that names do not overprint one another: the first of right,
 * left, above and below whose box (estimated on a 1000 × 320 plot) is clear of those placed.
 */
function placeLabels(points: FunnelPoint[], x: (n: number) => number, y: (r: number) => number) {
  const W = 1000;
  const H = 320;
  const boxes: { x0: number; x1: number; y0: number; y1: number }[] = points.map((p) => ({
    x0: x(p.trials) * W - 6,
    x1: x(p.trials) * W + 6,
    y0: y(p.rate) * H - 6,
    y1: y(p.rate) * H + 6,
  }));
  const out = new Map<number, Place>();
  const order = [...points].sort((a, b) => a.trials - b.trials);
  for (const p of order) {
    const px = x(p.trials) * W;
    const py = y(p.rate) * H;
    const w = p.label.length * 7;
    const candidates = PLACES.map((place) => {
      const o = OFFSET[place];
      const x0 = o.anchor === 'start' ? px + o.dx : o.anchor === 'end' ? px + o.dx - w : px - w / 2;
      return { place, box: { x0, x1: x0 + w, y0: py + o.dy - 12, y1: py + o.dy + 2 } };
    });
    const clear = candidates.find(
      (c) =>
        c.box.x1 <= W + 90 &&
        c.box.x0 >= -40 &&
        boxes.every(
          (b) => c.box.x1 < b.x0 || c.box.x0 > b.x1 || c.box.y1 < b.y0 || c.box.y0 > b.y1,
        ),
    );
    const chosen = clear ?? candidates[0]!;
    boxes.push(chosen.box);
    out.set(p.id, chosen.place);
  }
  return out;
}

/**
 * Funnel plot: each shop's rate against its volume, with the network rate and the exact binomial
 * 95% and 99.8% limits as curves; or (kind "ratio") each shop's O/E against its expected
 * comebacks E, with 1 and the Poisson limits. Marks differ in shape as well as colour by band.
 */
export interface FunnelChartProps {
  points: FunnelPoint[];
  networkRate: number;
  xLabel: string;
  height?: number;
  kind?: 'rate' | 'ratio';
}

export function FunnelChartRecharts(props: FunnelChartProps) {
  const ratio = props.kind === 'ratio';
  const volumes = props.points.map((p) => p.trials);
  const xTicks = niceTicks(Math.max(...volumes) * 1.08, 6);
  const hi = xTicks.at(-1)!;
  const lo = ratio
    ? Math.max(0.5, Math.min(...volumes) * 0.5)
    : Math.max(2, Math.floor(Math.min(...volumes) * 0.5));
  const curves = funnelCurves(props.networkRate, lo, hi, 60, props.kind);
  const atLowest = ratio
    ? ratioFunnelLimits(Math.max(1, Math.min(...volumes)), 0.998)!.upper
    : funnelLimits(Math.min(...volumes), props.networkRate, 0.998).upper;
  const cap = ratio ? Infinity : 1;
  const yTicks = niceTicks(
    Math.min(
      cap,
      Math.max(...props.points.map((p) => p.rate), atLowest, props.networkRate * 2) * 1.05,
    ),
    5,
  );
  const top = Math.min(cap, yTicks.at(-1)!);
  const places = placeLabels(
    props.points,
    (n) => n / hi,
    (r) => 1 - r / top,
  );
  const byBand = (band: FairnessBand) =>
    props.points.filter((p) => p.band === band).map((p) => ({ ...p, n: p.trials }));
  const digits = top < 0.2 ? 1 : 0;
  return (
    <div style={{ height: props.height ?? 360 }}>
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={curves} margin={{ top: 16, right: 110, bottom: 28, left: 8 }}>
          <CartesianGrid stroke="#e9e0cd" strokeDasharray="3 3" />
          <XAxis
            dataKey="n"
            type="number"
            domain={[0, hi]}
            ticks={xTicks}
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
            ticks={yTicks}
            tickFormatter={(x: number) =>
              ratio ? `${x.toFixed(top < 3 ? 1 : 0)}×` : `${(x * 100).toFixed(digits)}%`
            }
            tick={{ fill: '#475569', fontSize: 12 }}
            width={52}
            allowDataOverflow
          />
          <Line {...guideLine('upper998', '99.8% upper limit', FUNNEL_COLOURS.limit998)} />
          <Line {...guideLine('lower998', '99.8% lower limit', FUNNEL_COLOURS.limit998)} />
          <Line
            {...guideLine('upper95', '95% upper limit', FUNNEL_COLOURS.limit95, { dash: '5 4' })}
          />
          <Line
            {...guideLine('lower95', '95% lower limit', FUNNEL_COLOURS.limit95, { dash: '5 4' })}
          />
          <Line
            {...guideLine(
              'network',
              ratio ? 'As expected (O/E = 1)' : 'Network rate',
              FUNNEL_COLOURS.network,
              {
                width: 2,
              },
            )}
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
                content={(l: {
                  x?: number | string;
                  y?: number | string;
                  width?: number | string;
                  height?: number | string;
                  index?: number;
                  value?: unknown;
                }) => {
                  const p = byBand(band)[l.index ?? 0];
                  if (!p || l.x == null || l.y == null) return null;
                  const o = OFFSET[places.get(p.id) ?? 'right'];
                  const cx = Number(l.x) + Number(l.width ?? 0) / 2;
                  const cy = Number(l.y) + Number(l.height ?? 0) / 2;
                  return (
                    <text
                      x={cx + o.dx}
                      y={cy + o.dy}
                      textAnchor={o.anchor}
                      fill="#0f172a"
                      fontSize={12}
                      fontWeight={500}
                    >
                      {String(l.value)}
                    </text>
                  );
                }}
              />
            </Scatter>
          ))}
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
