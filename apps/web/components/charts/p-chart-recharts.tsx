'use client';

import {
  CartesianGrid,
  ComposedChart,
  ErrorBar,
  Line,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { P_CHART_COLOURS } from './chart-colours';
import { guideLine } from './guide-line';
import { niceTicks } from './ticks';

export interface PChartDatum {
  label: string;
  rate: number | null;
  lower: number | null;
  upper: number | null;
  signal: 'above' | 'below' | null;
  /** A month whose figures are not final yet: drawn as a hollow ring. */
  provisional?: boolean;
  /** The rate's 95% interval, drawn as a whisker. */
  interval?: { lower: number; upper: number } | null;
}

/** The 3-sigma limits change with each month's volume, so they are drawn as steps. */
const limit = { width: 1.25, dash: '4 3', step: true };

/**
 * A p-chart: the monthly rate with its 95% interval as a whisker, its centre line, and the
 * 3-sigma limits for each month's own volume (drawn as steps, only where a month has them).
 * Months outside the limits are drawn as larger brick-red diamonds; months not final yet as
 * hollow rings.
 */
export interface PChartProps {
  points: PChartDatum[];
  center: number | null;
  formatLabel: (label: string) => string;
  height?: number;
}

export function PChartRecharts(props: PChartProps) {
  const data = props.points.map((p) => ({
    ...p,
    center: props.center,
    spread:
      p.rate === null || !p.interval
        ? null
        : [Math.max(0, p.rate - p.interval.lower), Math.max(0, p.interval.upper - p.rate)],
  }));
  const ticks = niceTicks(
    Math.min(
      1,
      Math.max(
        (props.center ?? 0) * 2,
        0.01,
        ...data.map((d) => Math.max(d.rate ?? 0, d.upper ?? 0, d.interval?.upper ?? 0)),
      ),
    ),
    4,
  );
  const top = Math.min(1, ticks.at(-1)!);
  // Whole percents only when the scale is wide enough for them not to round ticks together.
  const pct = (x: number) => `${(x * 100).toFixed(top < 0.2 ? 1 : 0)}%`;
  return (
    <div style={{ height: props.height ?? 200 }}>
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
          <CartesianGrid stroke="#e9e0cd" strokeDasharray="3 3" vertical={false} />
          <XAxis
            dataKey="label"
            tickFormatter={(l: string) => props.formatLabel(l).slice(0, 3)}
            tick={{ fill: '#475569', fontSize: 11 }}
            interval="preserveStartEnd"
          />
          <YAxis
            domain={[0, top]}
            tickFormatter={pct}
            tick={{ fill: '#475569', fontSize: 11 }}
            width={40}
          />
          <Tooltip
            formatter={(value: number, name: string) => [
              `${(Number(value) * 100).toFixed(1)}%`,
              name,
            ]}
            labelFormatter={(l: string) => props.formatLabel(l)}
          />
          <Line {...guideLine('upper', 'Upper limit', P_CHART_COLOURS.limit, limit)} />
          <Line {...guideLine('lower', 'Lower limit', P_CHART_COLOURS.limit, limit)} />
          {props.center !== null && (
            <Line {...guideLine('center', 'Centre line', P_CHART_COLOURS.centre)} />
          )}
          <Line
            dataKey="rate"
            name="Comeback rate"
            stroke={P_CHART_COLOURS.rate}
            strokeWidth={2}
            connectNulls={false}
            isAnimationActive={false}
            dot={(p: { cx?: number; cy?: number; index?: number; payload?: PChartDatum }) => {
              const key = `dot-${p.index}`;
              if (p.cx == null || p.cy == null || p.payload?.rate == null) return <g key={key} />;
              if (p.payload.signal) {
                const { cx, cy } = p;
                return (
                  <path
                    key={key}
                    d={`M${cx} ${cy - 6} L${cx + 6} ${cy} L${cx} ${cy + 6} L${cx - 6} ${cy} Z`}
                    fill={P_CHART_COLOURS.signal}
                  />
                );
              }
              if (p.payload.provisional)
                return (
                  <circle
                    key={key}
                    cx={p.cx}
                    cy={p.cy}
                    r={4}
                    fill="#ffffff"
                    stroke={P_CHART_COLOURS.rate}
                    strokeWidth={1.5}
                  />
                );
              return <circle key={key} cx={p.cx} cy={p.cy} r={3} fill={P_CHART_COLOURS.rate} />;
            }}
          >
            <ErrorBar
              dataKey="spread"
              direction="y"
              width={5}
              strokeWidth={1.25}
              stroke={P_CHART_COLOURS.interval}
            />
          </Line>
        </ComposedChart>
      </ResponsiveContainer>
    </div>
  );
}
