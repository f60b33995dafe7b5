'use client';

import { LineChart } from '@tremor/react';
import { SERIES_COLOURS } from './chart-figure';

/** One line per series over months (Tremor), in the brand's series colours. */
export type TrendLinesProps = {
  data: Record<string, string | number | null>[];
  series: string[];
  valueFormatter: (v: number) => string;
  height?: string;
};

export function TrendLinesTremor(props: TrendLinesProps) {
  return (
    <LineChart
      className={props.height ?? 'h-64'}
      data={props.data}
      index="month"
      categories={props.series}
      colors={props.series.map((_, i) => SERIES_COLOURS[i % SERIES_COLOURS.length]!.tremor)}
      valueFormatter={props.valueFormatter}
      connectNulls={false}
      showLegend={false}
      yAxisWidth={56}
      autoMinValue={false}
      showAnimation={false}
    />
  );
}
