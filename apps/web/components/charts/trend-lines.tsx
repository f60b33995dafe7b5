'use client';

import dynamic from 'next/dynamic';
import { useInView } from './use-in-view';
import type { TrendLinesProps } from './trend-lines-tremor';

// Tremor and its chart library weigh about 130 kB gzip: they load only when the chart scrolls
// near the viewport, so a page's first load does not carry them.
const Chart = dynamic(() => import('./trend-lines-tremor').then((m) => m.TrendLinesTremor), {
  ssr: false,
});

/** One line per series over months, drawn once it comes into view. */
export function TrendLines(props: TrendLinesProps) {
  const [ref, inView] = useInView<HTMLDivElement>();
  return (
    <div ref={ref} className={props.height ?? 'h-64'}>
      {inView && <Chart {...props} />}
    </div>
  );
}
