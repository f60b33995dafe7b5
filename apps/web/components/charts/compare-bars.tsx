'use client';

import dynamic from 'next/dynamic';
import { useInView } from './use-in-view';
import type { CompareBarsProps } from './compare-bars-tremor';

// Tremor and its chart library weigh about 130 kB gzip: they load only when the chart scrolls
// near the viewport, so a page's first load does not carry them.
const Chart = dynamic(() => import('./compare-bars-tremor').then((m) => m.CompareBarsTremor), {
  ssr: false,
});

/** Horizontal bars comparing one figure across groups, drawn once it comes into view. */
export function CompareBars(props: CompareBarsProps) {
  const [ref, inView] = useInView<HTMLDivElement>();
  return (
    <div ref={ref} className={'h-56'}>
      {inView && <Chart {...props} />}
    </div>
  );
}
