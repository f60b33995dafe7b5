import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import type { ReactNode } from 'react';
import { NotAllowed } from '~/components/ui';
import { can } from '~/lib/permissions';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { getRoundReport } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import {
  formatInstant,
  formatLocalDate,
  formatPeriod,
  formatScore,
  formLabel,
} from '../../_components/format';
import {
  ANSWER_LABELS,
  CORRECTIVE_ACTION_STATUS_LABELS,
  levelLabel,
  SEVERITY_LABELS,
  VERDICT_LABELS,
} from '../../_components/labels';
import { PrintButton } from '../../_components/print-button';
import './report.css';

export const metadata: Metadata = { title: 'Audit report' };
export const dynamic = 'force-dynamic';

function Section(props: { title: string; id: string; children: ReactNode }) {
  return (
    <section
      aria-labelledby={props.id}
      className="mt-6 rounded-lg border border-sand-200 bg-white p-5 shadow-sm"
    >
      <h2 id={props.id} className="text-xl font-semibold">
        {props.title}
      </h2>
      <div className="mt-3">{props.children}</div>
    </section>
  );
}

const th = 'py-1.5 pr-4 text-left font-medium';
const thNum = 'num py-1.5 pr-4 font-medium';

export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'audits:read')) return <NotAllowed />;
  const id = idParam.safeParse((await params).id);
  if (!id.success) notFound();
  let report;
  try {
    report = await getRoundReport(principal, id.data);
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  const { round, items, samples } = report;
  const tz = round.shop.timeZone;
  const plan = (round.plan ?? {}) as {
    table?: string;
    planCodeLetter?: string;
    hundredPercent?: boolean;
  };
  const itemTitle = new Map(items.map((i) => [i.id, i.title]));
  const decisionText =
    round.decision === null
      ? `Not decided yet: ${round.scored} of ${round.sampleSize} sampled jobs scored.`
      : `${round.failures} of ${round.sampleSize} sampled jobs fell short of the standard (accept with ${round.acceptNumber} or fewer, reject at ${round.rejectNumber}): the lot of ${round.lotSize} jobs is ${round.decision}.`;
  return (
    <article className="audit-report" aria-labelledby="report-title">
      <div className="no-print mb-4 flex flex-wrap items-center justify-between gap-3">
        <Link href={`/audits/${round.id}`} className="text-sea-700 underline underline-offset-2">
          ← Round #{round.id}
        </Link>
        <PrintButton />
      </div>
      <header className="border-b-2 border-slate-900 pb-3">
        <p className="text-sm font-medium tracking-wide text-slate-600 uppercase">
          Reelwright audit report
        </p>
        <h1 id="report-title" className="text-3xl font-semibold">
          Round #{round.id} · {round.shop.name}
        </h1>
        <p className="mt-1 text-lg">
          Jobs ready {formatPeriod(round.periodStart, round.periodEnd)} ·{' '}
          {formLabel(round.form.title, round.form.version)}
        </p>
      </header>

      <Section title="Decision" id="report-decision">
        <p className="text-lg font-semibold">
          {round.decision === 'rejected'
            ? 'Lot rejected'
            : round.decision === 'accepted'
              ? 'Lot accepted'
              : 'Not decided'}
        </p>
        <p className="mt-1">{decisionText}</p>
        {round.decidedAt && (
          <p className="mt-1 text-slate-700">Decided {formatInstant(round.decidedAt, tz)}.</p>
        )}
      </Section>

      <Section title="Plan" id="report-plan">
        <table className="w-full max-w-2xl">
          <caption className="sr-only">Sampling plan</caption>
          <tbody>
            {(
              [
                ['Standard', 'ISO 2859-1 single sampling (= ANSI/ASQ Z1.4, MIL-STD-105E)'],
                [
                  'Inspection',
                  `${SEVERITY_LABELS[round.severity]}${plan.table ? ` (Table ${plan.table})` : ''}`,
                ],
                ['AQL', `${round.aql}% nonconforming`],
                ['Inspection level', levelLabel(round.inspectionLevel)],
                ['Lot size', String(round.lotSize)],
                [
                  'Code letter',
                  `${round.codeLetter}${plan.planCodeLetter && plan.planCodeLetter !== round.codeLetter ? ` (plan at ${plan.planCodeLetter} after the arrow)` : ''}`,
                ],
                [
                  'Sample size',
                  `${round.sampleSize}${plan.hundredPercent ? ' (100% inspection)' : ''}`,
                ],
                ['Accept (Ac) / reject (Re)', `${round.acceptNumber} / ${round.rejectNumber}`],
                ['Planned', `${formatInstant(round.plannedAt, tz)} by ${round.plannedBy.name}`],
                ['Auditor', round.auditor?.name ?? '—'],
              ] as const
            ).map(([k, v]) => (
              <tr key={k} className="border-b border-sand-100">
                <th scope="row" className={th}>
                  {k}
                </th>
                <td className="py-1.5">{v}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section title="Seed and sample" id="report-seed">
        <p>
          Seed <span className="font-mono break-all">{round.seed}</span>
        </p>
        <p className="mt-1">
          Lot: {round.lotJobIds.length} jobs by id ascending; sample drawn by a seeded partial
          Fisher–Yates shuffle (seedrandom ARC4). Redrawing from this seed and lot gives the same
          jobs in the same order.
        </p>
        <p className="mt-1">
          Sample in draw order: {round.samples.map((s) => `#${s.jobId}`).join(', ')}
        </p>
      </Section>

      <Section title="Scores and verdicts" id="report-scores">
        <table className="w-full">
          <caption className="sr-only">Score and verdict of each sampled job</caption>
          <thead>
            <tr className="border-b border-slate-400 text-sm">
              <th scope="col" className={thNum}>
                #
              </th>
              <th scope="col" className={th}>
                Job
              </th>
              <th scope="col" className={thNum}>
                Score
              </th>
              <th scope="col" className={th}>
                Verdict
              </th>
              <th scope="col" className={th}>
                Failed items and notes
              </th>
            </tr>
          </thead>
          <tbody>
            {samples.map((s) => {
              const failed = s.answers.filter((a) => a.result === 'fail');
              return (
                <tr key={s.jobId} className="border-b border-sand-100 align-top">
                  <td className="num py-1.5 pr-4">{s.position}</td>
                  <th scope="row" className="py-1.5 pr-4 text-left font-medium">
                    #{s.jobId}
                    <span className="block text-sm font-normal text-slate-700">{s.reel}</span>
                  </th>
                  <td className="num py-1.5 pr-4">
                    {s.score === null ? '—' : formatScore(s.score)}
                  </td>
                  <td className="py-1.5 pr-4">
                    {s.verdict ? (
                      <span
                        className={`badge rounded px-1.5 font-medium ${s.verdict === 'meets_standard' ? 'text-sea-800' : 'bg-brick-50 text-brick-800'}`}
                      >
                        {VERDICT_LABELS[s.verdict]}
                      </span>
                    ) : (
                      'Not scored'
                    )}
                  </td>
                  <td className="py-1.5 text-sm">
                    {failed.length === 0 ? (
                      '—'
                    ) : (
                      <ul>
                        {failed.map((a) => (
                          <li key={a.itemId}>
                            <span className="font-medium">{itemTitle.get(a.itemId)}</span>
                            {a.note ? `: ${a.note}` : ''}
                          </li>
                        ))}
                      </ul>
                    )}
                    {s.note && <p className="mt-1 text-slate-700">Note: {s.note}</p>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </Section>

      <Section title="Items of the form" id="report-items">
        <table className="w-full">
          <caption className="sr-only">Answers per item across the sample</caption>
          <thead>
            <tr className="border-b border-slate-400 text-sm">
              <th scope="col" className={th}>
                Item
              </th>
              <th scope="col" className={thNum}>
                Weight
              </th>
              <th scope="col" className={thNum}>
                {ANSWER_LABELS.pass}
              </th>
              <th scope="col" className={thNum}>
                {ANSWER_LABELS.fail}
              </th>
              <th scope="col" className={thNum}>
                {ANSWER_LABELS.not_applicable}
              </th>
            </tr>
          </thead>
          <tbody>
            {items.map((item) => {
              const count = (r: string) =>
                samples.filter((s) => s.answers.some((a) => a.itemId === item.id && a.result === r))
                  .length;
              return (
                <tr key={item.id} className="border-b border-sand-100">
                  <th scope="row" className="py-1.5 pr-4 text-left font-normal">
                    {item.title}
                    {item.critical && (
                      <span className="ml-2 text-sm font-semibold">(critical)</span>
                    )}
                  </th>
                  <td className="num py-1.5 pr-4">{item.weight}</td>
                  <td className="num py-1.5 pr-4">{count('pass')}</td>
                  <td className="num py-1.5 pr-4">{count('fail')}</td>
                  <td className="num py-1.5 pr-4">{count('not_applicable')}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </Section>

      {round.correctiveActions.length > 0 && (
        <Section title="Corrective actions" id="report-actions">
          <ul className="space-y-1">
            {round.correctiveActions.map((a) => (
              <li key={a.id}>
                #{a.id} {a.title} — {CORRECTIVE_ACTION_STATUS_LABELS[a.status]}, owner{' '}
                {a.ownerName ?? 'not set'}, due {formatLocalDate(a.dueOn)}
              </li>
            ))}
          </ul>
        </Section>
      )}
      <p className="mt-6 text-sm text-slate-600">
        Printed from Reelwright by {principal.name}; times in {tz.replace('_', ' ')}.
      </p>
    </article>
  );
}
