'use client';

import { useEffect, useRef, useState } from 'react';
import { niceTicks } from './ticks';

export interface HistogramDatum {
  /** Bin start and end in the unit shown; the last bin may be open-ended. */
  from: number;
  to: number | null;
  count: number;
}

export const HISTOGRAM_COLOURS = { bar: '#4f998c', median: '#163733', p90: '#a03c28' };

/** Width the drawing assumes before the browser has measured it (the server's HTML). */
const FIRST_WIDTH = 520;
const MARGIN = { top: 26, right: 16, bottom: 34, left: 40 };

/** The element's width in CSS pixels, followed as it changes; null until measured. */
function useWidth<T extends Element>() {
  const ref = useRef<T>(null);
  const [width, setWidth] = useState<number | null>(null);
  useEffect(() => {
    const element = ref.current;
    if (!element) return;
    setWidth(element.getBoundingClientRect().width);
    if (typeof ResizeObserver === 'undefined') return;
    const observer = new ResizeObserver((entries) => {
      const w = entries[0]?.contentRect.width;
      if (w) setWidth(w);
    });
    observer.observe(element);
    return () => observer.disconnect();
  }, []);
  return [ref, width] as const;
}

/**
 * A histogram of turnaround with the median and the 90th percentile marked as labelled lines,
 * drawn as plain SVG: it is in the server's HTML and needs no chart library in the browser.
 * Bars sit on a numeric axis so that the marks fall at their exact values.
 */
export function HistogramChart(props: {
  bins: HistogramDatum[];
  median: number | null;
  p90: number | null;
  unit: string;
  height?: number;
}) {
  const [ref, measured] = useWidth<HTMLDivElement>();
  const width = Math.max(200, measured ?? FIRST_WIDTH);
  const height = props.height ?? 240;
  const binWidth = props.bins[0]
    ? (props.bins[0].to ?? props.bins[0].from + 1) - props.bins[0].from
    : 1;
  const end = (props.bins.at(-1)?.from ?? 0) + binWidth;
  const yTicks = niceTicks(Math.max(1, ...props.bins.map((b) => b.count)), 4).map(Math.round);
  const top = yTicks.at(-1)!;
  const plotW = width - MARGIN.left - MARGIN.right;
  const plotH = height - MARGIN.top - MARGIN.bottom;
  const x = (v: number) => MARGIN.left + (Math.min(v, end) / end) * plotW;
  const y = (c: number) => MARGIN.top + (1 - c / top) * plotH;
  const bottom = MARGIN.top + plotH;
  const xTicks = props.bins.filter((_, i) => i % 2 === 0).map((b) => b.from);
  const marks = [
    { value: props.median, label: 'Median', colour: HISTOGRAM_COLOURS.median, dash: undefined },
    { value: props.p90, label: 'p90', colour: HISTOGRAM_COLOURS.p90, dash: '5 3' },
  ].filter((m): m is typeof m & { value: number } => m.value !== null);
  // Two marks close together: their labels lean apart (median left, p90 right) to stay legible.
  const close = marks.length === 2 && Math.abs(x(marks[0]!.value) - x(marks[1]!.value)) < 90;
  return (
    <div ref={ref} style={{ height }}>
      <svg
        width="100%"
        height={height}
        viewBox={`0 0 ${width} ${height}`}
        className="overflow-visible"
      >
        {yTicks.map((t) => (
          <g key={`y${t}`}>
            <line
              x1={MARGIN.left}
              x2={width - MARGIN.right}
              y1={y(t)}
              y2={y(t)}
              stroke="#e9e0cd"
              strokeDasharray="3 3"
            />
            <text x={MARGIN.left - 6} y={y(t) + 4} textAnchor="end" fill="#475569" fontSize={11}>
              {t}
            </text>
          </g>
        ))}
        {props.bins.map((b) => {
          const x0 = x(b.from);
          const x1 = x(b.from + binWidth);
          const range =
            b.to === null
              ? `${fmt(b.from)} ${props.unit} or more`
              : `${fmt(b.from)}–${fmt(b.to)} ${props.unit}`;
          return (
            <rect
              key={b.from}
              x={x0 + 0.5}
              y={y(b.count)}
              width={Math.max(0, x1 - x0 - 1)}
              height={bottom - y(b.count)}
              fill={HISTOGRAM_COLOURS.bar}
            >
              <title>{`${range}: ${b.count} jobs`}</title>
            </rect>
          );
        })}
        <line x1={MARGIN.left} x2={width - MARGIN.right} y1={bottom} y2={bottom} stroke="#94a3b8" />
        {xTicks.map((t) => (
          <text
            key={`x${t}`}
            x={x(t)}
            y={bottom + 14}
            textAnchor="middle"
            fill="#475569"
            fontSize={11}
          >
            {fmt(t)}
          </text>
        ))}
        <text x={width - MARGIN.right} y={height - 2} textAnchor="end" fill="#334155" fontSize={12}>
          {props.unit}
        </text>
        {marks.map((m, i) => (
          <g key={m.label}>
            <line
              x1={x(m.value)}
              x2={x(m.value)}
              y1={MARGIN.top}
              y2={bottom}
              stroke={m.colour}
              strokeWidth={2}
              strokeDasharray={m.dash}
            />
            <text
              x={x(m.value)}
              y={MARGIN.top - 8}
              textAnchor={close ? (i === 0 ? 'end' : 'start') : 'middle'}
              dx={close ? (i === 0 ? -4 : 4) : 0}
              fill={m.colour}
              fontSize={12}
            >
              {`${m.label} ${fmt(m.value)}`}
            </text>
          </g>
        ))}
      </svg>
    </div>
  );
}

function fmt(v: number) {
  return Number.isInteger(v) ? String(v) : v.toFixed(1);
}
