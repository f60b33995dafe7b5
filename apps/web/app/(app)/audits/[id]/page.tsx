import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader, Panel, Stat } from '~/components/ui';
import { can } from '~/lib/permissions';
import { SERVICE_LABELS } from '~/lib/labels';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { getRound } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import {
  CorrectiveActionStatusBadge,
  RoundStatusBadge,
  SeverityBadge,
  VerdictBadge,
} from '../_components/badges';
import {
  formatInstant,
  formatLocalDate,
  formatPeriod,
  formatScore,
  formLabel,
} from '../_components/format';
import { levelLabel } from '../_components/labels';
import { RedrawCheck } from '../_components/redraw-check';

export const metadata: Metadata = { title: 'Audit round' };
export const dynamic = 'force-dynamic';

const linkClass = 'text-sea-700 underline underline-offset-2 hover:text-sea-900';

export default async function RoundPage({ params }: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'audits:read')) return <NotAllowed />;
  const id = idParam.safeParse((await params).id);
  if (!id.success) notFound();
  let round;
  try {
    round = await getRound(principal, id.data);
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  const tz = round.shop.timeZone;
  const auditing =
    principal.role === 'auditor' && round.status !== 'decided' && round.status !== 'cancelled';
  const nextToScore = round.samples.find((s) => !s.completedAt);
  const plan = (round.plan ?? {}) as {
    table?: string;
    planCodeLetter?: string;
    hundredPercent?: boolean;
    severityReason?: string;
    lotOrder?: string;
    draw?: string;
  };
  return (
    <>
      <p className="mb-2">
        <Link href="/audits" className={linkClass}>
          ← Audits
        </Link>
      </p>
      <PageHeader
        title={`Round #${round.id} · ${round.shop.name}`}
        lead={`Jobs that became ready ${formatPeriod(round.periodStart, round.periodEnd)} (local dates at the shop).`}
        actions={
          <div className="flex flex-wrap items-center gap-3">
            <RoundStatusBadge status={round.status} decision={round.decision} />
            {auditing && nextToScore && (
              <Link
                href={`/audits/${round.id}/samples/${nextToScore.jobId}`}
                className="inline-flex min-h-11 items-center rounded-md bg-sea-700 px-4 font-semibold text-white hover:bg-sea-800"
              >
                {round.scored === 0 ? 'Start scoring' : 'Score the next job'}
              </Link>
            )}
            <Link
              href={`/audits/${round.id}/report`}
              className="inline-flex min-h-11 items-center rounded-md border border-sea-700 px-4 font-semibold text-sea-800 hover:bg-sea-50"
            >
              Report
            </Link>
          </div>
        }
      />
      <dl className="mb-8 grid grid-cols-2 gap-4 md:grid-cols-3 lg:grid-cols-6">
        <Stat label="Lot" value={round.lotSize} hint="jobs ready in the period" />
        <Stat
          label="Sample"
          value={round.sampleSize}
          hint={plan.hundredPercent ? 'the whole lot' : `code letter ${round.codeLetter}`}
        />
        <Stat
          label="Accept / reject"
          value={`${round.acceptNumber} / ${round.rejectNumber}`}
          hint="failures"
        />
        <Stat label="Scored" value={`${round.scored} of ${round.sampleSize}`} />
        <Stat label="Failures" value={round.failures ?? '—'} hint="needs work or critical miss" />
        <Stat
          label="Decision"
          value={
            round.decision === 'accepted'
              ? 'Accepted'
              : round.decision === 'rejected'
                ? 'Rejected'
                : '—'
          }
          hint={
            round.decidedAt
              ? formatInstant(round.decidedAt, tz, 'd MMM yyyy')
              : 'when every sample is scored'
          }
        />
      </dl>

      <div className="grid gap-8 lg:grid-cols-2">
        <Panel title="Plan">
          <dl className="grid grid-cols-[max-content_minmax(0,1fr)] gap-x-6 gap-y-2">
            <dt className="text-slate-600">Inspection</dt>
            <dd>
              <SeverityBadge severity={round.severity} />
              {plan.severityReason && (
                <p className="mt-1 text-sm text-slate-700">{plan.severityReason}</p>
              )}
            </dd>
            <dt className="text-slate-600">AQL</dt>
            <dd>{round.aql}% nonconforming</dd>
            <dt className="text-slate-600">Inspection level</dt>
            <dd>{levelLabel(round.inspectionLevel)}</dd>
            <dt className="text-slate-600">Code letter</dt>
            <dd>
              {round.codeLetter} (Table I)
              {plan.planCodeLetter && plan.planCodeLetter !== round.codeLetter
                ? `; plan read at ${plan.planCodeLetter} after the table’s arrow`
                : ''}
            </dd>
            <dt className="text-slate-600">Table</dt>
            <dd>{plan.table ? `MIL-STD-105E Table ${plan.table}` : '—'}</dd>
            <dt className="text-slate-600">Audit form</dt>
            <dd>
              {formLabel(round.form.title, round.form.version)}, {round.form.items} items
            </dd>
            <dt className="text-slate-600">Planned</dt>
            <dd>
              {formatInstant(round.plannedAt, tz)} by {round.plannedBy.name}
            </dd>
            <dt className="text-slate-600">Auditor</dt>
            <dd>{round.auditor?.name ?? '—'}</dd>
          </dl>
        </Panel>

        <Panel title="Seed and lot" description="What anyone needs to redraw the sample.">
          <dl className="space-y-3">
            <div>
              <dt className="text-slate-600">Seed</dt>
              <dd className="font-mono text-lg break-all">{round.seed}</dd>
            </div>
            <div>
              <dt className="text-slate-600">Lot</dt>
              <dd>
                {round.lotJobIds.length} job ids, {plan.lotOrder ?? 'ascending'}; drawn by{' '}
                {plan.draw ?? 'seeded partial Fisher–Yates'}.
                <details className="mt-2">
                  <summary className="cursor-pointer font-medium text-sea-800">
                    Show the lot’s job ids
                  </summary>
                  <p
                    className="num mt-2 max-h-40 overflow-y-auto text-left text-sm break-words text-slate-700"
                    tabIndex={0}
                  >
                    {round.lotJobIds.join(', ')}
                  </p>
                </details>
              </dd>
            </div>
          </dl>
          <RedrawCheck roundId={round.id} />
        </Panel>
      </div>

      <div className="mt-8">
        <Panel title="Sample" description="In the order drawn.">
          <div className="overflow-x-auto">
            <table className="w-full min-w-[48rem] text-left">
              <caption className="sr-only">Sampled jobs of round #{round.id}</caption>
              <thead>
                <tr className="border-b border-sand-300 text-sm text-slate-600">
                  <th scope="col" className="num py-2 pr-4 font-medium">
                    #
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Job
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Reel and service
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Ready
                  </th>
                  <th scope="col" className="num py-2 pr-4 font-medium">
                    Score
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Verdict
                  </th>
                </tr>
              </thead>
              <tbody>
                {round.samples.map((s) => (
                  <tr key={s.jobId} className="border-b border-sand-100">
                    <td className="num py-3 pr-4">{s.position}</td>
                    <th scope="row" className="py-3 pr-4 font-medium">
                      <Link href={`/audits/${round.id}/samples/${s.jobId}`} className={linkClass}>
                        Job #{s.jobId}
                      </Link>
                    </th>
                    <td className="py-3 pr-4">
                      {s.reel}
                      <span className="block text-sm text-slate-600">
                        {SERVICE_LABELS[s.serviceType as keyof typeof SERVICE_LABELS] ??
                          s.serviceType}
                      </span>
                    </td>
                    <td className="py-3 pr-4">
                      {s.readyAt ? formatInstant(s.readyAt, tz, 'd MMM yyyy') : '—'}
                    </td>
                    <td className="num py-3 pr-4">
                      {s.score === null ? '—' : formatScore(s.score)}
                    </td>
                    <td className="py-3">
                      {s.verdict ? (
                        <VerdictBadge verdict={s.verdict} />
                      ) : (
                        <span className="text-slate-600">
                          {s.answered > 0
                            ? `Saved part-way (${s.answered} of ${round.form.items})`
                            : 'Not scored'}
                        </span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Panel>
      </div>

      {(round.correctiveActions.length > 0 || round.emails) && (
        <div className="mt-8 grid gap-8 lg:grid-cols-2">
          <Panel title="Corrective actions" description="Opened when the lot is rejected.">
            {round.correctiveActions.length ? (
              <ul className="space-y-3">
                {round.correctiveActions.map((a) => (
                  <li key={a.id}>
                    <Link href={`/corrective-actions#action-${a.id}`} className={linkClass}>
                      #{a.id} {a.title}
                    </Link>
                    <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-slate-700">
                      <CorrectiveActionStatusBadge status={a.status} /> Owner{' '}
                      {a.ownerName ?? 'not set'}, due {formatLocalDate(a.dueOn)}
                    </p>
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-slate-600">None.</p>
            )}
          </Panel>
          {round.emails && (
            <Panel title="E-mail sent" description="Queued with the change that caused it.">
              <ul className="space-y-2">
                {round.emails.map((m) => (
                  <li key={m.id}>
                    <span className="font-medium">{m.to}</span>: {m.subject}{' '}
                    <span className="text-sm text-slate-600">({m.status})</span>
                  </li>
                ))}
              </ul>
            </Panel>
          )}
        </div>
      )}
    </>
  );
}
