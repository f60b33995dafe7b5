'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { Panel } from '~/components/ui';
import { comparisonQuery, networkTrendsQuery, type PeriodParams } from '~/lib/queries/network';
import { ComparisonTable } from './comparison-table';
import { Explain } from './explain';
import { CensoringNote } from './censoring-note';
import { formatCount, formatInterval, formatMoney, formatPercent } from './format';
import { FunnelPanel } from './funnel-panel';
import { PeriodPicker } from './period-picker';
import { formatMonth, formatPeriod, viewHref } from './periods';
import { ComebackPCharts, RevenueTrend, TurnaroundTrend } from './trend-charts';
import { UnitsToggle, useUnit } from './units-toggle';

function Loading({ what }: { what: string }) {
  return <p className="text-slate-600">Loading {what}…</p>;
}

function Failed({ error }: { error: Error }) {
  return (
    <p role="alert" className="text-brick-700">
      Could not load the figures: {error.message}
    </p>
  );
}

/** The network view: period, the shops side by side, funnel plots and monthly trends. */
export function NetworkView(props: {
  params: PeriodParams;
  trendParams: PeriodParams;
  today: string;
  invalid: boolean;
  /** Set when the address names no period and the default is shown: the quarter with final figures. */
  defaultShown?: { finalQuarter: { from: string; to: string; label: string } };
}) {
  const unit = useUnit();
  const comparison = useQuery(comparisonQuery(props.params));
  const pTrend = useQuery(networkTrendsQuery(props.trendParams, 'comebacks'));
  const tTrend = useQuery(networkTrendsQuery(props.trendParams, 'turnaround'));
  const rTrend = useQuery(networkTrendsQuery(props.trendParams, 'revenue'));
  if (comparison.isPending) return <Loading what="the comparison" />;
  if (comparison.isError) return <Failed error={comparison.error} />;
  const data = comparison.data;
  const span = `${formatMonth(props.trendParams.from.slice(0, 7))} – ${formatMonth(props.trendParams.to.slice(0, 7))}`;
  const period = formatPeriod(data.period.from, data.period.to);
  const seasons = data.shops.map((s) => ({ start: s.shop.seasonStart, end: s.shop.seasonEnd }));
  return (
    <>
      <PeriodPicker
        path="/network"
        from={data.period.from}
        to={data.period.to}
        today={props.today}
        seasons={seasons}
        units={unit}
        region={props.params.region}
        regions={data.regions.length > 1 ? data.regions : undefined}
      />
      {props.invalid && (
        <p
          role="status"
          className="mb-4 rounded-md border border-amber-300 bg-amber-50 px-4 py-2 text-amber-900"
        >
          The period in the address is not a valid pair of dates, so the last whole month is shown.
        </p>
      )}
      {props.defaultShown && (
        <DefaultPeriodNote
          period={data.period}
          finalQuarter={props.defaultShown.finalQuarter}
          region={props.params.region}
        />
      )}
      <dl className="mb-6 grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Fact
          label="Shops shown"
          value={formatCount(data.view.shops)}
          hint={data.region ? data.region.name : `of ${data.network.shops} in the network`}
          explain={`The shops in your view${data.region ? ` in ${data.region.name}` : ''}; each is still judged against all ${data.network.shops} shops of the network.`}
        />
        <Fact
          label="Jobs ready"
          value={formatCount(data.view.jobsReady)}
          hint={period}
          explain="Jobs of the shops shown that became ready for pickup in the period, each in its shop's own time zone."
        />
        <Fact
          label={
            data.network.comebacks.comparison === 'ratio'
              ? 'Network comeback rate (estimate)'
              : 'Network comeback rate'
          }
          value={formatPercent(data.network.comebacks.rate)}
          hint={
            data.network.comebacks.comparison === 'ratio'
              ? `95% ${formatInterval(data.network.comebacks.estimate.interval)}; ${formatCount(data.network.comebacks.estimate.stillFollowed)} of ${formatCount(data.network.comebacks.estimate.jobs)} jobs still followed`
              : `${formatCount(data.network.comebacks.events)} of ${formatCount(data.network.comebacks.trials)} jobs, all ${data.network.shops} shops`
          }
          explain={
            data.network.comebacks.comparison === 'ratio'
              ? `The estimated chance that a job collected in the period comes back for ${data.settings.countedAttributions.map((a) => a.replace('_', ' ')).join(' or ')} within ${data.settings.warrantyDays} days, from the follow-up so far of every shop's jobs (Kaplan–Meier, or the network curve carried by the period's observed ÷ expected comebacks while no job has been followed for the whole window).`
              : `Comebacks for ${data.settings.countedAttributions.map((a) => a.replace('_', ' ')).join(' or ')} over the jobs counted at every shop of the network: the rate each shop is judged against.`
          }
        />
        <Fact
          label="Network revenue per bench hour"
          value={formatMoney(data.network.revenue.perBenchHourCents)}
          hint="Labour + parts − discount"
          explain="Billed revenue of every shop's jobs that became ready in the period, over all their logged bench hours."
        />
      </dl>
      <CensoringNote
        comebacks={data.view.comebacks}
        reference={data.reference}
        warrantyDays={data.settings.warrantyDays}
        to={data.period.to}
      />
      <div className="grid grid-cols-[minmax(0,1fr)] gap-8">
        <Panel
          title="Shops side by side"
          description={`${period}. Each figure counts the shop's own jobs in its own time zone.`}
        >
          <div className="mb-2">
            <UnitsToggle />
          </div>
          <ComparisonTable data={data} unit={unit} caption={`Shops side by side, ${period}`} />
        </Panel>
        <Panel
          title="Fair comparison: rate against volume"
          description="A small shop's rate swings more by chance. The curves show how far from the network rate a shop of each volume can fall by chance alone."
        >
          <FunnelPanel data={data} />
        </Panel>
        <Panel
          title={`Trends, ${span}`}
          description="The twelve months to the end of the period, month by month in each shop's time zone."
        >
          <div className="grid grid-cols-[minmax(0,1fr)] gap-10">
            <section aria-labelledby="trend-comebacks-heading">
              <h3 id="trend-comebacks-heading" className="sr-only">
                Monthly comeback rate per shop
              </h3>
              {pTrend.isPending ? (
                <Loading what="the comeback trend" />
              ) : pTrend.isError ? (
                <Failed error={pTrend.error} />
              ) : pTrend.data.metric === 'comebacks' ? (
                <ComebackPCharts result={pTrend.data} span={span} />
              ) : null}
            </section>
            {tTrend.isPending ? (
              <Loading what="the turnaround trend" />
            ) : tTrend.isError ? (
              <Failed error={tTrend.error} />
            ) : tTrend.data.metric === 'turnaround' ? (
              <TurnaroundTrend result={tTrend.data} unit={unit} span={span} />
            ) : null}
            {rTrend.isPending ? (
              <Loading what="the revenue trend" />
            ) : rTrend.isError ? (
              <Failed error={rTrend.error} />
            ) : rTrend.data.metric === 'revenue' ? (
              <RevenueTrend result={rTrend.data} span={span} />
            ) : null}
          </div>
        </Panel>
      </div>
    </>
  );
}

/** Why the page opens on the last whole month, and where the final figures are. */
function DefaultPeriodNote(props: {
  period: { from: string; to: string };
  finalQuarter: { from: string; to: string; label: string };
  region?: number;
}) {
  const month = formatMonth(props.period.from.slice(0, 7));
  return (
    <p className="mb-4 rounded-md border border-sea-200 bg-sea-50 px-4 py-2 text-slate-800">
      <strong className="font-semibold">Showing {month}, the last whole month.</strong> It is the
      latest month with every day&apos;s work in, and recent enough to act on: a shop going wrong
      shows here within weeks, because its comebacks so far are weighed against what each job&apos;s
      follow-up predicts. For final comeback rates, with every warranty window closed, see{' '}
      <Link
        className="font-medium text-sea-800 underline"
        href={viewHref('/network', { ...props.finalQuarter, region: props.region })}
      >
        {props.finalQuarter.label}
      </Link>
      .
    </p>
  );
}

function Fact(props: { label: string; value: string; hint?: string; explain: string }) {
  return (
    <div className="rounded-lg border border-sand-200 bg-white px-4 py-3 shadow-sm">
      <dt className="text-sm font-medium text-slate-600">{props.label}</dt>
      <dd className="mt-1 text-2xl font-semibold text-slate-900 tabular-nums">
        <Explain text={props.explain}>{props.value}</Explain>
      </dd>
      {props.hint && <dd className="mt-0.5 text-sm text-slate-600">{props.hint}</dd>}
    </div>
  );
}
