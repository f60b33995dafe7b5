'use client';

import dynamic from 'next/dynamic';
import type { PChartProps } from './p-chart-recharts';
import { useInView } from './use-in-view';

export { P_CHART_COLOURS } from './chart-colours';
export type { PChartDatum, PChartProps } from './p-chart-recharts';

// Recharts weighs about 100 kB gzip: a p-chart's drawing loads only when it scrolls near the
// viewport, so the page's first load does not carry it.
const Chart = dynamic(() => import('./p-chart-recharts').then((m) => m.PChartRecharts), {
  ssr: false,
});

/** A p-chart (see p-chart-recharts.tsx), drawn once it comes into view. */
export function PChart(props: PChartProps) {
  const [ref, inView] = useInView<HTMLDivElement>();
  return (
    <div ref={ref} style={{ height: props.height ?? 200 }}>
      {inView && <Chart {...props} />}
    </div>
  );
}
