'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { OpenJobsTable } from '~/components/open-jobs-table';
import { ChartFigure, FigureTable, LegendItem } from '~/components/charts/chart-figure';
import { CompareBars } from '~/components/charts/compare-bars';
import { HISTOGRAM_COLOURS, HistogramChart } from '~/components/charts/histogram-chart';
import { Panel } from '~/components/ui';
import { JOB_STATE_LABELS } from '~/lib/labels';
import { shopMetricsQuery, shopTrendsQuery, type PeriodParams } from '~/lib/queries/network';
import type { TurnaroundUnit } from '~/lib/network';
import type { RevenueGroup, ShopMetricsResult } from '~/server/queries/network';
import {
  formatCount,
  formatDuration,
  formatMoney,
  formatPercent,
  inUnit,
  unitSuffix,
  unitWord,
} from '../../../network/_components/format';
import { CensoringNote } from '../../../network/_components/censoring-note';
import { PeriodPicker } from '../../../network/_components/period-picker';
import { formatMonth, formatPeriod } from '../../../network/_components/periods';
import {
  ComebackPCharts,
  RevenueTrend,
  TurnaroundTrend,
} from '../../../network/_components/trend-charts';
import { UnitsToggle, useUnit } from '../../../network/_components/units-toggle';
import { Comebacks } from './shop-comebacks';
import { Figures } from './shop-figures';

function Histograms({ m, unit }: { m: ShopMetricsResult; unit: TurnaroundUnit }) {
  const f = m.figures;
  const perDay = f.shop.openMinutesPerDay;
  const conv = (x: number) => Number(inUnit(x, unit, perDay).toFixed(2));
  const period = formatPeriod(m.period.from, m.period.to);
  if (m.histogram.bins.length === 0) {
    return <p className="text-slate-600">No job became ready in this period.</p>;
  }
  const fig = (which: 'customer' | 'bench') => {
    const t = which === 'customer' ? f.customerTurnaround : f.benchTurnaround;
    const name = which === 'customer' ? 'Customer turnaround' : 'Bench turnaround';
    const title = `${name} of the ${formatCount(t.count)} jobs ready in ${period}, in ${unitWord(unit)}`;
    const bins = m.histogram.bins.map((b) => ({
      from: conv(b.from),
      to: b.to === null ? null : conv(b.to),
      count: b[which],
    }));
    const range = (b: (typeof bins)[number]) =>
      b.to === null
        ? `${b.from} ${unitSuffix(unit)} or more`
        : `${b.from}–${b.to} ${unitSuffix(unit)}`;
    return (
      <ChartFigure
        id={`histogram-${which}`}
        title={title}
        summary={`Median ${formatDuration(t.median, unit, perDay)}, 90th percentile ${formatDuration(t.p90, unit, perDay)}${which === 'customer' ? '' : ' (time waiting on parts left out)'}.`}
        legend={
          <div className="flex flex-wrap gap-x-4 gap-y-1">
            <LegendItem colour={HISTOGRAM_COLOURS.bar}>Jobs in each band of time</LegendItem>
            <LegendItem colour={HISTOGRAM_COLOURS.median} mark="line">
              Median
            </LegendItem>
            <LegendItem colour={HISTOGRAM_COLOURS.p90} mark="dash">
              90th percentile
            </LegendItem>
          </div>
        }
        table={
          <FigureTable
            caption={title}
            columns={[{ label: 'Turnaround' }, { label: 'Jobs', numeric: true }]}
            rows={bins.map((b) => ({
              key: String(b.from),
              cells: [range(b), formatCount(b.count)],
            }))}
          />
        }
      >
        <HistogramChart
          bins={bins}
          median={t.median === null ? null : conv(t.median)}
          p90={t.p90 === null ? null : conv(t.p90)}
          unit={unitSuffix(unit)}
        />
      </ChartFigure>
    );
  };
  return (
    <div className="grid grid-cols-[minmax(0,1fr)] gap-8 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
      {fig('customer')}
      {fig('bench')}
    </div>
  );
}

function RevenueGroups(props: {
  id: string;
  title: string;
  groups: RevenueGroup[];
  first: string;
}) {
  const title = props.title;
  const top = props.groups.filter((g) => g.perBenchHourCents !== null);
  const best = [...top].sort((a, b) => b.perBenchHourCents! - a.perBenchHourCents!)[0];
  return (
    <ChartFigure
      id={props.id}
      title={title}
      summary={
        best
          ? `Highest: ${best.label} at ${formatMoney(best.perBenchHourCents)} per bench hour.`
          : 'No bench time logged in this period.'
      }
      table={
        <FigureTable
          caption={title}
          columns={[
            { label: props.first },
            { label: 'Jobs', numeric: true },
            { label: 'Billed', numeric: true },
            { label: 'Bench hours', numeric: true },
            { label: 'Per bench hour', numeric: true },
            { label: 'Labour rate realised', numeric: true },
          ]}
          rows={props.groups.map((g) => ({
            key: g.key,
            cells: [
              g.label,
              formatCount(g.jobs),
              formatMoney(g.revenueCents, true),
              (g.benchMinutes / 60).toFixed(1),
              formatMoney(g.perBenchHourCents),
              formatPercent(g.realisation, 0),
            ],
          }))}
        />
      }
    >
      <CompareBars
        data={props.groups.map((g) => ({
          label: g.label,
          value:
            g.perBenchHourCents === null ? null : Number((g.perBenchHourCents / 100).toFixed(2)),
        }))}
        seriesName="Revenue per bench hour"
        valueFormatter={(v) => formatMoney(v * 100)}
      />
    </ChartFigure>
  );
}

const OPEN_STATES = ['checked_in', 'on_bench', 'waiting_parts', 'ready'] as const;

function OpenWork({
  m,
  shopId,
  benchHref,
}: {
  m: ShopMetricsResult;
  shopId: number;
  benchHref: (id: number) => string;
}) {
  const name = m.figures.shop.name;
  return (
    <>
      <ul className="mb-4 flex flex-wrap gap-2">
        {OPEN_STATES.map((s) => (
          <li key={s}>
            <Link
              href={`/bench?shopId=${shopId}&state=${s}`}
              className="inline-flex min-h-11 items-center gap-2 rounded-md border border-sand-300 bg-sand-50 px-3 text-slate-800 hover:border-sea-600 hover:bg-sea-50"
            >
              <span className="font-semibold tabular-nums">{formatCount(m.openCounts[s])}</span>
              {JOB_STATE_LABELS[s].toLowerCase()}
              <span className="sr-only">, in the bench list</span>
            </Link>
          </li>
        ))}
        <li>
          <Link
            href={`/bench?shopId=${shopId}`}
            className="inline-flex min-h-11 items-center rounded-md px-3 font-medium text-sea-700 underline-offset-2 hover:underline"
          >
            All of {name}&apos;s jobs on the bench list
          </Link>
        </li>
      </ul>
      <OpenJobsTable
        rows={m.openLongest}
        timeZone={m.figures.shop.timeZone}
        caption={`Open jobs at ${name} not yet ready, open longest first`}
        showTechnician
        href={benchHref}
        empty="No work in progress: every reel is ready for pickup or collected."
      />
    </>
  );
}

/** One shop's page: its figures for the period, their distribution and trend, comebacks, money and open work. */
export function ShopView(props: {
  shopId: number;
  period: PeriodParams;
  trend: PeriodParams;
  today: string;
  invalid: boolean;
}) {
  const unit = useUnit();
  const metrics = useQuery(shopMetricsQuery(props.shopId, props.period));
  const pTrend = useQuery(shopTrendsQuery(props.shopId, props.trend, 'comebacks'));
  const tTrend = useQuery(shopTrendsQuery(props.shopId, props.trend, 'turnaround'));
  const rTrend = useQuery(shopTrendsQuery(props.shopId, props.trend, 'revenue'));
  if (metrics.isPending) return <p className="text-slate-600">Loading the shop&apos;s figures…</p>;
  if (metrics.isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load the figures: {metrics.error.message}
      </p>
    );
  const m = metrics.data;
  const shop = m.figures.shop;
  const period = formatPeriod(m.period.from, m.period.to);
  const span = `${formatMonth(props.trend.from.slice(0, 7))} – ${formatMonth(props.trend.to.slice(0, 7))}`;
  const benchHref = (id: number) => `/bench/jobs/${id}`;
  return (
    <>
      <PeriodPicker
        path={`/shops/${props.shopId}`}
        from={m.period.from}
        to={m.period.to}
        today={props.today}
        seasons={[{ start: shop.seasonStart, end: shop.seasonEnd }]}
        units={unit}
      />
      {props.invalid && (
        <p
          role="status"
          className="mb-4 rounded-md border border-amber-300 bg-amber-50 px-4 py-2 text-amber-900"
        >
          The period in the address is not a valid pair of dates, so the last whole month is shown.
        </p>
      )}
      <CensoringNote
        comebacks={m.figures.comebacks}
        reference={m.reference}
        warrantyDays={m.settings.warrantyDays}
        to={m.period.to}
      />
      <div className="grid grid-cols-[minmax(0,1fr)] gap-8">
        <Panel
          title={`Figures for ${period}`}
          description={`Judged against the whole network of ${m.network.shops} shops. Hover over or focus a figure for what it means.`}
        >
          <div className="mb-3">
            <UnitsToggle />
          </div>
          <Figures m={m} unit={unit} />
        </Panel>
        <Panel
          title="How long jobs took"
          description="Turnaround of the jobs that became ready in the period, in opening time only."
        >
          <Histograms m={m} unit={unit} />
        </Panel>
        <Panel
          title={`Over time, ${span}`}
          description="The twelve months to the end of the period, in the shop's time zone."
        >
          <div className="grid grid-cols-[minmax(0,1fr)] gap-10">
            {pTrend.data?.metric === 'comebacks' && (
              <ComebackPCharts result={pTrend.data} span={span} />
            )}
            {tTrend.data?.metric === 'turnaround' && (
              <TurnaroundTrend result={tTrend.data} unit={unit} span={span} />
            )}
            {rTrend.data?.metric === 'revenue' && <RevenueTrend result={rTrend.data} span={span} />}
            {(pTrend.isPending || tTrend.isPending || rTrend.isPending) && (
              <p className="text-slate-600">Loading the trends…</p>
            )}
          </div>
        </Panel>
        <Panel
          title={`Comebacks of jobs collected in ${period}`}
          description="Every return of these jobs so far, with its review."
        >
          <Comebacks m={m} benchHref={benchHref} />
        </Panel>
        <Panel
          title="Revenue per bench hour"
          description={`Jobs that became ready in ${period}: billed revenue over logged bench time.`}
        >
          <div className="grid grid-cols-[minmax(0,1fr)] gap-8 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
            <RevenueGroups
              id="revenue-technician"
              title={
                m.ownTechnicianOnly
                  ? `Your revenue per bench hour, ${period}`
                  : `Revenue per bench hour by technician, ${period}`
              }
              groups={m.byTechnician}
              first="Technician"
            />
            <RevenueGroups
              id="revenue-service"
              title={`Revenue per bench hour by service, ${period}`}
              groups={m.byServiceType}
              first="Service"
            />
          </div>
        </Panel>
        <Panel
          title="Open work"
          description="Reels not yet collected, now; each count opens the bench list filtered to it. Below, the work not yet ready that has been in the shop longest."
        >
          <OpenWork m={m} shopId={props.shopId} benchHref={benchHref} />
        </Panel>
      </div>
    </>
  );
}
