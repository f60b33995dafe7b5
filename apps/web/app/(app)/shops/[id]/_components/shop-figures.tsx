import type { ReactNode } from 'react';
import type { TurnaroundUnit } from '~/lib/network';
import type { ShopMetricsResult } from '~/server/queries/network';
import { SeverityBadge } from '../../../audits/_components/badges';
import { BandBadge } from '../../../network/_components/band-badge';
import { Explain } from '../../../network/_components/explain';
import {
  actionsText,
  auditText,
  comebackBandText,
  comebackText,
  formatScore,
  jobsReadyText,
  onTimeText,
  realisationText,
  revenueText,
  turnaroundText,
  waitingText,
} from '../../../network/_components/explanations';
import {
  bandExplanation,
  formatCount,
  formatDuration,
  formatInterval,
  formatMoney,
  formatPercent,
} from '../../../network/_components/format';

// The shop's headline figures for the period, each explained on hover and focus.
function Card(props: { label: string; children: ReactNode; hint?: ReactNode }) {
  return (
    <div className="rounded-lg border border-sand-200 bg-white px-4 py-3 shadow-sm">
      <dt className="text-sm font-medium text-slate-600">{props.label}</dt>
      <dd className="mt-1 text-xl font-semibold text-slate-900 tabular-nums">{props.children}</dd>
      {props.hint && <dd className="mt-1 text-sm text-slate-600">{props.hint}</dd>}
    </div>
  );
}

export function Figures({ m, unit }: { m: ShopMetricsResult; unit: TurnaroundUnit }) {
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
        label={f.comebacks.comparison === 'ratio' ? 'Comeback rate (estimate)' : 'Comeback rate'}
        hint={
          <>
            <span className="block">95% interval {formatInterval(f.comebacks.interval)}</span>
            {f.comebacks.comparison === 'ratio' && (
              <span className="block">
                {formatCount(f.comebacks.estimate.stillFollowed)} of{' '}
                {formatCount(f.comebacks.estimate.jobs)} jobs still followed
                {f.comebacks.ratio
                  ? `; ${formatCount(f.comebacks.ratio.observed)} back, ${f.comebacks.ratio.expected.toFixed(1)} expected`
                  : ''}
              </span>
            )}
            <Explain
              text={comebackBandText(f.comebacks, m.network.comebacks.rate)}
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
            <>
              <span className="block">
                {formatPercent(f.audits.rate)} failed, 95% interval{' '}
                {formatInterval(f.audits.interval)}
              </span>
              <Explain
                text={bandExplanation('audit samples', f.audits, m.network.audits.rate)}
                className="mt-1 no-underline"
              >
                <BandBadge band={f.audits.band} side={f.audits.side} />
              </Explain>
            </>
          ) : undefined
        }
      >
        <Explain text={auditText(f)}>
          {f.audits.rounds === 0
            ? 'No audit rounds yet'
            : `${formatCount(f.audits.events)} failed of ${formatCount(f.audits.trials)}`}
        </Explain>
      </Card>
      <Card
        label="Average audit score"
        hint={
          f.audits.trials === 0
            ? undefined
            : `Of ${formatCount(f.audits.trials)} scored sample${f.audits.trials === 1 ? '' : 's'}, out of 100`
        }
      >
        <Explain text={auditText(f)}>
          {f.audits.averageScore === null ? 'None scored yet' : formatScore(f.audits.averageScore)}
        </Explain>
      </Card>
      <Card
        label="Audit rounds rejected"
        hint={
          <>
            <span className="mb-1 block">Of the rounds decided in the period</span>
            <SeverityBadge severity={f.audits.severity} />
          </>
        }
      >
        <Explain text={auditText(f)}>
          {f.audits.roundsAccepted + f.audits.roundsRejected === 0
            ? 'None decided'
            : `${formatCount(f.audits.roundsRejected)} of ${formatCount(f.audits.roundsAccepted + f.audits.roundsRejected)}`}
        </Explain>
      </Card>
      <Card label="Open corrective actions" hint="Now, whatever the period">
        <Explain text={actionsText(f)}>{formatCount(f.correctiveActions.open)}</Explain>
      </Card>
    </dl>
  );
}
