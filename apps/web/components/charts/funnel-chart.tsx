'use client';

import dynamic from 'next/dynamic';
import type { FunnelChartProps } from './funnel-chart-recharts';
import { useInView } from './use-in-view';

export { FUNNEL_COLOURS } from './chart-colours';
export type { FunnelChartProps, FunnelPoint } from './funnel-chart-recharts';

// Recharts weighs about 100 kB gzip: the funnel's drawing loads only when it scrolls near the
// viewport, so the page's first load does not carry it.
const Chart = dynamic(() => import('./funnel-chart-recharts').then((m) => m.FunnelChartRecharts), {
  ssr: false,
});

/** The funnel plot (see funnel-chart-recharts.tsx), drawn once it comes into view. */
export function FunnelChart(props: FunnelChartProps) {
  const [ref, inView] = useInView<HTMLDivElement>();
  // A funnel needs at least one shop with a volume to place; a region or period with none
  // (nothing collected, no round decided yet) gets a line of text instead of a broken chart.
  const points = props.points.filter((p) => Number.isFinite(p.trials) && p.trials > 0);
  if (points.length === 0) {
    return (
      <p className="text-sm text-slate-600">
        No shop in this view has figures for this chart in the period.
      </p>
    );
  }
  return (
    <div ref={ref} style={{ height: props.height ?? 360 }}>
      {inView && <Chart {...props} points={points} />}
    </div>
  );
}
