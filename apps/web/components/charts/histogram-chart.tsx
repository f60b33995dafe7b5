'use client';

import {
  Bar,
  BarChart,
  CartesianGrid,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from 'recharts';
import { niceTicks } from './ticks';

export interface HistogramDatum {
  /** Bin start and end in the unit shown; the last bin may be open-ended. */
  from: number;
  to: number | null;
  count: number;
}

export const HISTOGRAM_COLOURS = { bar: '#4f998c', median: '#163733', p90: '#a03c28' };

/**
 * A histogram of turnaround with the median and the 90th percentile marked as labelled lines.
 * Bars sit on a numeric axis so that the marks fall at their exact values.
 */
export function HistogramChart(props: {
  bins: HistogramDatum[];
  median: number | null;
  p90: number | null;
  unit: string;
  height?: number;
}) {
  const width = props.bins[0]
    ? (props.bins[0].to ?? props.bins[0].from + 1) - props.bins[0].from
    : 1;
  const data = props.bins.map((b) => ({
    ...b,
    mid: b.from + width / 2,
    range:
      b.to === null
        ? `${fmt(b.from)} ${props.unit} or more`
        : `${fmt(b.from)}–${fmt(b.to)} ${props.unit}`,
  }));
  const end = (props.bins.at(-1)?.from ?? 0) + width;
  const yTicks = niceTicks(Math.max(1, ...props.bins.map((b) => b.count)), 4).map(Math.round);
  return (
    <div style={{ height: props.height ?? 240 }}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart
          data={data}
          margin={{ top: 24, right: 16, bottom: 16, left: 0 }}
          barCategoryGap={1}
        >
          <CartesianGrid stroke="#e9e0cd" strokeDasharray="3 3" vertical={false} />
          <XAxis
            dataKey="mid"
            type="number"
            domain={[0, end]}
            ticks={data.filter((_, i) => i % 2 === 0).map((d) => d.from)}
            tickFormatter={(v: number) => fmt(v)}
            tick={{ fill: '#475569', fontSize: 11 }}
            label={{
              value: props.unit,
              position: 'insideBottomRight',
              offset: -8,
              fill: '#334155',
              fontSize: 12,
            }}
          />
          <YAxis
            allowDecimals={false}
            domain={[0, yTicks.at(-1)!]}
            ticks={yTicks}
            tick={{ fill: '#475569', fontSize: 11 }}
            width={36}
          />
          <Tooltip
            formatter={(value: number) => [value, 'Jobs']}
            labelFormatter={(_: unknown, payload: { payload?: { range?: string } }[]) =>
              payload?.[0]?.payload?.range ?? ''
            }
          />
          <Bar dataKey="count" name="Jobs" fill={HISTOGRAM_COLOURS.bar} isAnimationActive={false} />
          {props.median !== null && (
            <ReferenceLine
              x={Math.min(props.median, end)}
              stroke={HISTOGRAM_COLOURS.median}
              strokeWidth={2}
              label={{
                value: `Median ${fmt(props.median)}`,
                position: 'top',
                fill: HISTOGRAM_COLOURS.median,
                fontSize: 12,
              }}
            />
          )}
          {props.p90 !== null && (
            <ReferenceLine
              x={Math.min(props.p90, end)}
              stroke={HISTOGRAM_COLOURS.p90}
              strokeWidth={2}
              strokeDasharray="5 3"
              label={{
                value: `p90 ${fmt(props.p90)}`,
                position: 'top',
                fill: HISTOGRAM_COLOURS.p90,
                fontSize: 12,
              }}
            />
          )}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}

function fmt(v: number) {
  return Number.isInteger(v) ? String(v) : v.toFixed(1);
}
