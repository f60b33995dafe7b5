'use client';

import {
  ChartFigure,
  FigureTable,
  LegendItem,
  SERIES_COLOURS,
} from '~/components/charts/chart-figure';
import { P_CHART_COLOURS, PChart } from '~/components/charts/p-chart';
import { TrendLines } from '~/components/charts/trend-lines';
import type { TurnaroundUnit } from '~/lib/network';
import type { TrendsResult } from '~/server/queries/network';
import {
  DASH,
  formatCount,
  formatInterval,
  formatMoney,
  formatPercent,
  inUnit,
  unitSuffix,
  unitWord,
} from './format';
import { formatMonth } from './periods';

type Of<M extends TrendsResult['metric']> = Extract<TrendsResult, { metric: M }>;

function SeriesLegend({ names }: { names: string[] }) {
  return (
    <div className="flex flex-wrap gap-x-4 gap-y-1">
      {names.map((n, i) => (
        <LegendItem key={n} colour={SERIES_COLOURS[i % SERIES_COLOURS.length]!.hex} mark="line">
          {n}
        </LegendItem>
      ))}
    </div>
  );
}

/**
 * One chart per shop: each month's comeback estimate with its 95% interval. Final months form a
 * p-chart around the shop's own rate with 3-sigma limits; months with jobs still followed are
 * estimates, drawn as rings and never judged against the limits.
 */
export function ComebackPCharts({ result, span }: { result: Of<'comebacks'>; span: string }) {
  const single = result.shops.length === 1;
  return (
    <div
      className={
        single
          ? ''
          : 'grid grid-cols-[minmax(0,1fr)] gap-8 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]'
      }
    >
      {result.shops.map(({ shop, center, points }) => {
        const id = `pchart-${shop.id}`;
        const title = `${shop.name}: monthly comeback rate, ${span} (p-chart)`;
        const signals = points.filter((p) => p.signal);
        const estimates = points.filter((p) => p.provisional && p.trials > 0);
        const followed = estimates.reduce((n, p) => n + p.stillFollowed, 0);
        const jobs = estimates.reduce((n, p) => n + p.trials, 0);
        const estimated =
          estimates.length === 0
            ? ''
            : ` ${monthsText(estimates.map((p) => p.label))} ${estimates.length === 1 ? 'is an estimate' : 'are estimates'}: ${formatCount(followed)} of ${estimates.length === 1 ? 'its' : 'their'} ${formatCount(jobs)} jobs are still being followed inside the ${result.warrantyDays}-day window, so ${estimates.length === 1 ? 'it is' : 'each is'} drawn as a ring with its 95% interval and not judged against the limits.`;
        const summary =
          center === null
            ? `No month with final figures to set a centre line.${estimated}`
            : `Centre line ${formatPercent(center)} (the shop's own rate over the months with final figures). ${
                signals.length === 0
                  ? 'Every final month is inside its 3-sigma limits.'
                  : `${signals.map((p) => `${formatMonth(p.label)} is ${p.signal} its limits (${formatPercent(p.rate)})`).join('; ')}.`
              }${estimated}`;
        return (
          <ChartFigure
            key={shop.id}
            id={id}
            title={title}
            summary={summary}
            legend={
              <div className="flex flex-wrap gap-x-4 gap-y-1">
                <LegendItem colour={P_CHART_COLOURS.rate}>Final monthly rate</LegendItem>
                {estimates.length > 0 && (
                  <LegendItem colour={P_CHART_COLOURS.rate} mark="ring">
                    Estimate, jobs still followed
                  </LegendItem>
                )}
                <LegendItem colour={P_CHART_COLOURS.interval} mark="line">
                  95% interval
                </LegendItem>
                {center !== null && (
                  <LegendItem colour={P_CHART_COLOURS.centre} mark="line">
                    Centre line
                  </LegendItem>
                )}
                {center !== null && (
                  <LegendItem colour={P_CHART_COLOURS.limit} mark="dash">
                    3-sigma limits
                  </LegendItem>
                )}
                {signals.length > 0 && (
                  <LegendItem colour={P_CHART_COLOURS.signal} mark="diamond">
                    Outside the limits
                  </LegendItem>
                )}
              </div>
            }
            table={
              <FigureTable
                caption={title}
                columns={[
                  { label: 'Month' },
                  { label: 'Jobs collected', numeric: true },
                  { label: 'Comebacks so far', numeric: true },
                  { label: 'Still followed', numeric: true },
                  { label: 'Rate or estimate', numeric: true },
                  { label: '95% interval', numeric: true },
                  { label: 'Lower limit', numeric: true },
                  { label: 'Upper limit', numeric: true },
                  { label: 'Reading' },
                ]}
                rows={points.map((p) => ({
                  key: p.label,
                  cells: [
                    formatMonth(p.label),
                    formatCount(p.trials),
                    formatCount(p.events),
                    formatCount(p.stillFollowed),
                    formatPercent(p.rate),
                    p.interval ? formatInterval(p.interval) : DASH,
                    formatPercent(p.lower),
                    formatPercent(p.upper),
                    p.trials === 0
                      ? 'no jobs collected'
                      : p.provisional
                        ? p.method === 'network × ratio'
                          ? 'estimate: the network curve × observed ÷ expected, none followed through yet'
                          : p.method === null
                            ? 'estimate not available yet'
                            : 'estimate (Kaplan–Meier), not judged'
                        : p.signal
                          ? `final, ${p.signal} the limits`
                          : 'final, inside the limits',
                  ],
                }))}
              />
            }
          >
            <PChart
              points={points}
              center={center}
              formatLabel={formatMonth}
              height={single ? 260 : 200}
            />
          </ChartFigure>
        );
      })}
    </div>
  );
}

/** "September 2026" or "September, October and November 2026". */
function monthsText(labels: string[]) {
  const names = labels.map(formatMonth);
  if (names.length === 1) return names[0]!;
  return `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}

/** Monthly turnaround: per shop the customer p90 (network), or one shop's median and p90 of both. */
export function TurnaroundTrend(props: {
  result: Of<'turnaround'>;
  unit: TurnaroundUnit;
  span: string;
}) {
  const { result, unit } = props;
  const single = result.shops.length === 1;
  const fmt = (v: number) => `${v.toFixed(1)} ${unitSuffix(unit)}`;
  const conv = (m: number | null, perDay: number | null) =>
    m === null ? null : Number(inUnit(m, unit, perDay).toFixed(2));
  let series: string[];
  let data: Record<string, string | number | null>[];
  let title: string;
  if (single) {
    const s = result.shops[0]!;
    const perDay = s.shop.openMinutesPerDay;
    series = ['Customer median', 'Customer p90', 'Bench median', 'Bench p90'];
    data = s.points.map((p) => ({
      month: formatMonth(p.label),
      'Customer median': conv(p.customerMedian, perDay),
      'Customer p90': conv(p.customerP90, perDay),
      'Bench median': conv(p.benchMedian, perDay),
      'Bench p90': conv(p.benchP90, perDay),
    }));
    title = `${s.shop.name}: monthly turnaround in ${unitWord(unit)}, ${props.span}`;
  } else {
    series = result.shops.map((s) => s.shop.name);
    data = result.months.map((label, i) => ({
      month: formatMonth(label),
      ...Object.fromEntries(
        result.shops.map((s) => [
          s.shop.name,
          conv(s.points[i]!.customerP90, s.shop.openMinutesPerDay),
        ]),
      ),
    }));
    title = `Customer turnaround p90 by month in ${unitWord(unit)}, ${props.span}`;
  }
  const peak = (() => {
    let best: { name: string; month: string; v: number } | null = null;
    for (const row of data)
      for (const name of series) {
        const v = row[name];
        if (typeof v === 'number' && (!best || v > best.v))
          best = { name, month: String(row.month), v };
      }
    return best;
  })();
  const summary = peak
    ? single
      ? `The longest month was ${peak.month}: ${peak.name.toLowerCase()} ${fmt(peak.v)}.`
      : `Nine in ten jobs are ready within each line's value. The highest was ${peak.name} in ${peak.month} at ${fmt(peak.v)}.`
    : 'No job became ready in these months.';
  return (
    <ChartFigure
      id={single ? 'trend-turnaround-shop' : 'trend-turnaround'}
      title={title}
      summary={summary}
      legend={<SeriesLegend names={series} />}
      table={
        <FigureTable
          caption={title}
          columns={[{ label: 'Month' }, ...series.map((s) => ({ label: s, numeric: true }))]}
          rows={data.map((row) => ({
            key: String(row.month),
            cells: [
              String(row.month),
              ...series.map((s) => (typeof row[s] === 'number' ? fmt(row[s] as number) : DASH)),
            ],
          }))}
        />
      }
    >
      <TrendLines data={data} series={series} valueFormatter={fmt} />
    </ChartFigure>
  );
}

/** Monthly revenue per bench hour: per shop (network), or one shop's revenue and labour per hour. */
export function RevenueTrend(props: { result: Of<'revenue'>; span: string }) {
  const { result } = props;
  const single = result.shops.length === 1;
  const fmt = (v: number) => formatMoney(v * 100);
  const dollars = (c: number | null) => (c === null ? null : Number((c / 100).toFixed(2)));
  let series: string[];
  let data: Record<string, string | number | null>[];
  let title: string;
  if (single) {
    const s = result.shops[0]!;
    series = ['Revenue per bench hour', 'Labour per bench hour', 'Posted labour rate'];
    data = s.points.map((p) => ({
      month: formatMonth(p.label),
      'Revenue per bench hour': dollars(p.perBenchHourCents),
      'Labour per bench hour':
        p.benchMinutes > 0 ? dollars((p.labourCents * 60) / p.benchMinutes) : null,
      'Posted labour rate': dollars(s.shop.labourRateCents),
    }));
    title = `${s.shop.name}: revenue per bench hour by month, ${props.span}`;
  } else {
    series = result.shops.map((s) => s.shop.name);
    data = result.months.map((label, i) => ({
      month: formatMonth(label),
      ...Object.fromEntries(
        result.shops.map((s) => [s.shop.name, dollars(s.points[i]!.perBenchHourCents)]),
      ),
    }));
    title = `Revenue per bench hour by month, ${props.span}`;
  }
  const last = [...data].reverse().find((row) => series.some((s) => typeof row[s] === 'number'));
  const summary = last
    ? `In ${String(last.month)}: ${series
        .filter((s) => typeof last[s] === 'number')
        .map((s) => `${s} ${fmt(last[s] as number)}`)
        .join(', ')}.`
    : 'No bench time logged in these months.';
  return (
    <ChartFigure
      id={single ? 'trend-revenue-shop' : 'trend-revenue'}
      title={title}
      summary={summary}
      legend={<SeriesLegend names={series} />}
      table={
        <FigureTable
          caption={title}
          columns={[{ label: 'Month' }, ...series.map((s) => ({ label: s, numeric: true }))]}
          rows={data.map((row) => ({
            key: String(row.month),
            cells: [
              String(row.month),
              ...series.map((s) => (typeof row[s] === 'number' ? fmt(row[s] as number) : DASH)),
            ],
          }))}
        />
      }
    >
      <TrendLines data={data} series={series} valueFormatter={fmt} />
    </ChartFigure>
  );
}
