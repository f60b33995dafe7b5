'use client';

import { BarChart } from '@tremor/react';

/** Horizontal bars comparing one figure across groups (Tremor). */
export type CompareBarsProps = {
  data: { label: string; value: number | null }[];
  seriesName: string;
  valueFormatter: (v: number) => string;
  colour?: string;
};

export function CompareBarsTremor(props: CompareBarsProps) {
  const rows = props.data.map((d) => ({ label: d.label, [props.seriesName]: d.value ?? 0 }));
  return (
    <BarChart
      className="h-56"
      data={rows}
      index="label"
      categories={[props.seriesName]}
      colors={[props.colour ?? 'sea-600']}
      layout="vertical"
      valueFormatter={props.valueFormatter}
      showLegend={false}
      yAxisWidth={150}
      showAnimation={false}
    />
  );
}
