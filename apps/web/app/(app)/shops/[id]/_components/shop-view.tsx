'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { useState, type ReactNode } from 'react';
import { ChartFigure, FigureTable, LegendItem } from '~/components/charts/chart-figure';
import { CompareBars } from '~/components/charts/compare-bars';
import { HISTOGRAM_COLOURS, HistogramChart } from '~/components/charts/histogram-chart';
import { Panel, StateBadge } from '~/components/ui';
import { JOB_STATE_LABELS, SERVICE_LABELS } from '~/lib/labels';
import { shopMetricsQuery, shopTrendsQuery, type PeriodParams } from '~/lib/queries/network';
import type { TurnaroundUnit } from '~/lib/validators/network';
import type { RevenueGroup, ShopMetricsResult } from '~/server/queries/network';
import { BandBadge } from '../../../network/_components/band-badge';
import { CensoringNote } from '../../../network/_components/censoring-note';
import { Explain } from '../../../network/_components/explain';
import {
  actionsText,
  auditText,
  comebackText,
  jobsReadyText,
  onTimeText,
  realisationText,
  revenueText,
  turnaroundText,
  waitingText,
} from '../../../network/_components/explanations';
import {
  bandExplanation,
  DASH,
  formatCount,
  formatDuration,
  formatInterval,
  formatMoney,
  formatPercent,
  inUnit,
  unitSuffix,
  unitWord,
} from '../../../network/_components/format';
import { PeriodPicker } from '../../../network/_components/period-picker';
import { formatDay, formatMonth, formatPeriod } from '../../../network/_components/periods';
import {
  ComebackPCharts,
  RevenueTrend,
  TurnaroundTrend,
} from '../../../network/_components/trend-charts';
import { UnitsToggle, useUnit } from '../../../network/_components/units-toggle';

const ATTRIBUTION_LABELS: Record<string, string> = {
  workmanship: 'Workmanship',
  part_failure: 'Part failure',
  customer_damage: 'Customer damage',
  unrelated: 'Unrelated',
  undetermined: 'Undetermined',
};
const STATUS_LABELS = { open: 'Awaiting review', confirmed: 'Confirmed', dismissed: 'Dismissed' };

function Card(props: { label: string; children: ReactNode; hint?: ReactNode }) {
  return (
    <div className="rounded-lg border border-sand-200 bg-white px-4 py-3 shadow-sm">
      <dt className="text-sm font-medium text-slate-600">{props.label}</dt>
      <dd className="mt-1 text-xl font-semibold text-slate-900 tabular-nums">{props.children}</dd>
      {props.hint && <dd className="mt-1 text-sm text-slate-600">{props.hint}</dd>}
    </div>
  );
}

function Figures({ m, unit }: { m: ShopMetricsResult; unit: TurnaroundUnit }) {
  const f = m.figures;
  const perDay = f.shop.openMinutesPerDay;
  const d = (x: number | null) => formatDuration(x, unit, perDay);
  const waitingShare =
    f.customerTurnaround.totalMinutes > 0
      ? f.waitingPartsMinutes / f.customerTurnaround.totalMinutes
      : null;
  return (
    <dl className="grid grid-cols-2 gap-4 md:grid-cols-3 xl:grid-cols-5">
      <Card label="Jobs ready">
        <Explain text={jobsReadyText(f)}>{formatCount(f.jobsReady)}</Explain>
      </Card>
      <Card label="Customer turnaround" hint="Median · p90, check-in to ready">
        <Explain text={turnaroundText(f, 'customer', 'median', unit)}>
          {d(f.customerTurnaround.median)}
        </Explain>
        {' · '}
        <Explain text={turnaroundText(f, 'customer', 'p90', unit)}>
          {d(f.customerTurnaround.p90)}
        </Explain>
      </Card>
      <Card label="Bench turnaround" hint="Median · p90, less waiting on parts">
        <Explain text={turnaroundText(f, 'bench', 'median', unit)}>
          {d(f.benchTurnaround.median)}
        </Explain>
        {' · '}
        <Explain text={turnaroundText(f, 'bench', 'p90', unit)}>{d(f.benchTurnaround.p90)}</Explain>
      </Card>
      <Card label="Waiting on parts" hint="Share of all check-in-to-ready time">
        <Explain text={waitingText(f, unit)}>{formatPercent(waitingShare, 0)}</Explain>
      </Card>
      <Card label="On time" hint="Ready by the promised time">
        <Explain text={onTimeText(f)}>{formatPercent(f.onTime.share, 0)}</Explain>
      </Card>
      <Card
        label="Comeback rate"
        hint={
          <>
            <span className="block">95% interval {formatInterval(f.comebacks.interval)}</span>
            <Explain
              text={bandExplanation('comebacks', f.comebacks, m.network.comebacks.rate)}
              className="mt-1 no-underline"
            >
              <BandBadge band={f.comebacks.band} side={f.comebacks.side} />
            </Explain>
          </>
        }
      >
        <Explain text={comebackText(f, m.settings)}>{formatPercent(f.comebacks.rate)}</Explain>
        <span className="ml-2 text-sm font-normal text-slate-600">
          network {formatPercent(m.network.comebacks.rate)}
        </span>
      </Card>
      <Card
        label="Revenue per bench hour"
        hint={`Network ${formatMoney(m.network.revenue.perBenchHourCents)}`}
      >
        <Explain text={revenueText(f)}>{formatMoney(f.revenue.perBenchHourCents)}</Explain>
      </Card>
      <Card
        label="Labour rate realised"
        hint={`Posted rate ${formatMoney(f.shop.labourRateCents)} an hour`}
      >
        <Explain text={realisationText(f)}>{formatPercent(f.revenue.realisation, 0)}</Explain>
      </Card>
      <Card
        label="Audit results"
        hint={
          f.audits.trials > 0 ? (
            <Explain
              text={bandExplanation('audit samples', f.audits, m.network.audits.rate)}
              className="no-underline"
            >
              <BandBadge band={f.audits.band} side={f.audits.side} />
            </Explain>
          ) : undefined
        }
      >
        <Explain text={auditText(f)}>
          {f.audits.rounds === 0
            ? 'No audit rounds yet'
            : `${formatCount(f.audits.events)} failed of ${formatCount(f.audits.trials)}`}
        </Explain>
      </Card>
      <Card label="Open corrective actions" hint="Now, whatever the period">
        <Explain text={actionsText(f)}>{formatCount(f.correctiveActions.open)}</Explain>
      </Card>
    </dl>
  );
}

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

const COMEBACKS_SHOWN = 12;

function Comebacks({ m, benchHref }: { m: ShopMetricsResult; benchHref: (id: number) => string }) {
  const [all, setAll] = useState(false);
  const rows = all ? m.comebacks : m.comebacks.slice(0, COMEBACKS_SHOWN);
  const period = formatPeriod(m.period.from, m.period.to);
  if (rows.length === 0) {
    return <p className="text-slate-600">No job collected in {period} has come back so far.</p>;
  }
  const byAttribution = new Map<string, number>();
  for (const r of m.comebacks) {
    const key = r.status === 'confirmed' ? (r.attribution ?? 'undetermined') : r.status;
    byAttribution.set(key, (byAttribution.get(key) ?? 0) + 1);
  }
  const summary = [...byAttribution.entries()]
    .sort((a, b) => b[1] - a[1])
    .map(
      ([k, n]) =>
        `${ATTRIBUTION_LABELS[k] ?? STATUS_LABELS[k as keyof typeof STATUS_LABELS] ?? k} ${n}`,
    )
    .join(' · ');
  return (
    <>
      <p className="mb-3 text-slate-700">
        {formatCount(m.comebacks.length)} return{m.comebacks.length === 1 ? '' : 's'}: {summary}.
        Those marked “counts” are the events of the comeback rate; latest first.
      </p>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[52rem] text-left">
          <caption className="sr-only">Comebacks of jobs collected in {period}</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <th scope="col" className="py-2 pr-3 font-medium">
                Return job
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Original job
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Came back
              </th>
              <th scope="col" className="num py-2 pr-3 font-medium">
                Days after collection
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Symptom
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Review
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Attribution and root cause
              </th>
              <th scope="col" className="py-2 font-medium">
                In the rate
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id} className="border-b border-sand-100 align-top">
                <th scope="row" className="py-2 pr-3 font-medium">
                  <Link
                    href={benchHref(r.jobId)}
                    className="text-sea-700 underline-offset-2 hover:underline"
                  >
                    #{r.jobId}
                  </Link>
                </th>
                <td className="py-2 pr-3">
                  <Link
                    href={benchHref(r.originalJobId)}
                    className="text-sea-700 underline-offset-2 hover:underline"
                  >
                    #{r.originalJobId}
                  </Link>
                </td>
                <td className="py-2 pr-3 whitespace-nowrap">
                  {formatDay(r.detectedAt.slice(0, 10))}
                </td>
                <td className="num py-2 pr-3">{r.daysSinceCollection}</td>
                <td className="py-2 pr-3">{r.symptom ?? DASH}</td>
                <td className="py-2 pr-3">{STATUS_LABELS[r.status]}</td>
                <td className="py-2 pr-3">
                  {r.attribution ? ATTRIBUTION_LABELS[r.attribution] : DASH}
                  {r.rootCause && (
                    <span className="block text-sm text-slate-600">{r.rootCause}</span>
                  )}
                </td>
                <td className="py-2">{r.counted ? 'Counts' : 'Not counted'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {m.comebacks.length > COMEBACKS_SHOWN && (
        <button
          type="button"
          onClick={() => setAll(!all)}
          aria-expanded={all}
          className="mt-3 min-h-11 rounded-md border border-sea-700 px-4 font-medium text-sea-800 hover:bg-sea-50"
        >
          {all
            ? `Show the latest ${COMEBACKS_SHOWN}`
            : `Show all ${formatCount(m.comebacks.length)}`}
        </button>
      )}
    </>
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
  const zone = m.figures.shop.timeZone;
  const day = (iso: string) =>
    new Intl.DateTimeFormat('en-GB', {
      timeZone: zone,
      day: 'numeric',
      month: 'short',
      year: 'numeric',
    }).format(new Date(iso));
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
      {m.openLongest.length === 0 ? (
        <p className="py-4 text-slate-600">
          No work in progress: every reel is ready for pickup or collected.
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full min-w-[44rem] text-left">
            <caption className="sr-only">
              Open jobs at {name} not yet ready, open longest first
            </caption>
            <thead>
              <tr className="border-b border-sand-300 text-sm text-slate-600">
                <th scope="col" className="py-2 pr-4 font-medium">
                  Job
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  Customer and reel
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  Service
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  State
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  Technician
                </th>
                <th scope="col" className="py-2 pr-4 font-medium">
                  Checked in
                </th>
                <th scope="col" className="num py-2 font-medium">
                  Days open
                </th>
              </tr>
            </thead>
            <tbody>
              {m.openLongest.map((j) => (
                <tr key={j.id} className="border-b border-sand-100 align-top">
                  <th scope="row" className="py-3 pr-4 font-medium tabular-nums">
                    <Link
                      href={benchHref(j.id)}
                      className="text-sea-700 underline-offset-2 hover:underline"
                    >
                      #{j.id}
                    </Link>
                  </th>
                  <td className="py-3 pr-4">
                    <span className="block font-medium">{j.customerName}</span>
                    <span className="block text-sm text-slate-600">{j.reel}</span>
                  </td>
                  <td className="py-3 pr-4">
                    {SERVICE_LABELS[j.serviceType as keyof typeof SERVICE_LABELS] ?? j.serviceType}
                  </td>
                  <td className="py-3 pr-4">
                    <StateBadge state={j.state} />
                  </td>
                  <td className="py-3 pr-4">{j.technicianName ?? 'Unassigned'}</td>
                  <td className="py-3 pr-4 whitespace-nowrap">{day(j.checkedInAt)}</td>
                  <td className="num py-3">{formatCount(j.daysOpen)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
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
          The period in the address is not a valid pair of dates, so the latest quarter with final
          comeback figures is shown.
        </p>
      )}
      <CensoringNote
        collected={m.figures.comebacks.collected}
        censored={m.figures.comebacks.censored}
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
              title={`Revenue per bench hour by technician, ${period}`}
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
