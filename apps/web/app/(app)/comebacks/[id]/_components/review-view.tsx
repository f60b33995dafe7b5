'use client';

import { useQuery } from '@tanstack/react-query';
import { clientNow } from '~/lib/client-clock';
import Link from 'next/link';
import type { ReactNode } from 'react';
import { Panel, StateBadge } from '~/components/ui';
import { JOB_STATE_LABELS, SERVICE_LABELS, type JobState } from '~/lib/labels';
import { comebackDetailQuery } from '~/lib/queries/comebacks';
import { ATTRIBUTION_LABELS, DISPOSITION_LABELS, DISMISS_REASON_LABELS } from '~/lib/comebacks';
import type { ComebackDetail, JobFacts } from '~/server/queries/comebacks';
import { ComebackStatusBadge, CountedBadge, PastDeadlineBadge } from '../../_components/badges';
import { atTime, days, daysPast, formatMoney, onDate } from '../../_components/format';
import { ReassignForm } from './reassign-form';
import { ReviewForm } from './review-form';

export function ReviewView({ id }: { id: number }) {
  const { data: c, isError, error } = useQuery(comebackDetailQuery(id));
  if (!c)
    return (
      <p role={isError ? 'alert' : undefined} className="text-slate-700">
        {isError ? `Could not load the comeback: ${error.message}` : 'Loading the comeback…'}
      </p>
    );
  const tz = c.originalJob.timeZone;
  const counted =
    c.status === 'confirmed' &&
    c.insideWindow &&
    c.attribution !== null &&
    c.settings.countedAttributions.includes(c.attribution);
  return (
    <div className="space-y-6">
      <header className="rounded-lg border border-sand-200 bg-white p-5 shadow-sm sm:p-6">
        <p className="text-sm font-medium text-slate-600">
          <Link href="/comebacks" className="text-sea-700 underline underline-offset-2">
            Comebacks
          </Link>{' '}
          · {c.originalJob.shopName}
        </p>
        <h1 className="mt-1 flex flex-wrap items-center gap-3 text-3xl font-semibold tracking-tight text-slate-900">
          Comeback #{c.id}
          <ComebackStatusBadge status={c.status} attribution={c.attribution} />
          {c.overdue && (
            <PastDeadlineBadge days={daysPast(c.dueAt, new Date(clientNow()).toISOString())} />
          )}
          {counted && <CountedBadge />}
        </h1>
        <p className="mt-2 text-lg text-slate-700">
          <span className="font-medium text-slate-900">{c.customerName}</span>&apos;s {c.reel} came
          back {days(c.daysSinceCollection)} after it was collected
          {c.returnJob.shopId !== c.originalJob.shopId ? `, to ${c.returnJob.shopName}` : ''}.{' '}
          {c.insideWindow
            ? `Inside the ${c.settings.warrantyDays}-day warranty window.`
            : `Outside the ${c.settings.warrantyDays}-day warranty window: it does not count in the comeback rate whatever the review says.`}
        </p>
        <dl className="mt-4 grid grid-cols-2 gap-x-6 gap-y-3 md:grid-cols-4">
          <Fact label="Found">
            {c.detection === 'automatic' ? 'Flagged at check-in' : 'Linked by hand'},{' '}
            {onDate(c.createdAt, tz)}
          </Fact>
          <Fact label={c.status === 'open' ? 'Review due' : 'Reviewed'}>
            {c.status === 'open'
              ? `${onDate(c.dueAt, tz)} (${c.ageDays === 0 ? 'opened today' : `open ${days(c.ageDays)}`})`
              : `${onDate(c.reviewedAt, tz)}${c.reviewerName ? ` by ${c.reviewerName}` : ''}`}
          </Fact>
          <Fact label={c.status === 'open' ? 'Review by' : 'Assigned to'}>
            {c.assignee
              ? c.assignee.name
              : c.status === 'open'
                ? `${c.originalJob.shopName}’s lead`
                : 'The shop lead'}
          </Fact>
          <Fact label="What the customer reports">{c.symptom ?? 'Not recorded'}</Fact>
        </dl>
      </header>

      <div className="grid items-start gap-6 lg:grid-cols-2">
        <JobCard title="Original job" facts={c.originalDetail} steps={c.steps} />
        <JobCard title="Return job" facts={c.returnDetail} />
      </div>

      <div className="grid items-start gap-6 xl:grid-cols-[minmax(0,1.6fr)_minmax(0,1fr)]">
        <div className="space-y-6">
          {c.canReview ? <ReviewForm key={c.id} comeback={c} /> : <ReviewSummary c={c} />}
        </div>
        <div className="space-y-6">
          <RedoCost c={c} />
          {c.canReassign && <ReassignForm comeback={c} />}
          {c.correctiveActions.length > 0 && (
            <Panel title="Corrective action">
              <ul className="space-y-2">
                {c.correctiveActions.map((a) => (
                  <li key={a.id}>
                    <Link
                      href={`/corrective-actions#action-${a.id}`}
                      className="font-medium text-sea-700 underline underline-offset-2"
                    >
                      #{a.id} {a.title}
                    </Link>
                    <span className="block text-sm text-slate-700">
                      {a.owner ?? 'No owner'} · due {onDate(`${a.dueOn}T12:00:00Z`, 'UTC')} ·{' '}
                      {a.status.replace('_', ' ')}
                    </span>
                  </li>
                ))}
              </ul>
            </Panel>
          )}
          <History c={c} />
        </div>
      </div>
    </div>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-sm font-medium text-slate-600">{label}</dt>
      <dd className="mt-0.5 text-slate-900">{children}</dd>
    </div>
  );
}

const minutes = (m: number) =>
  m >= 60 ? `${Math.floor(m / 60)} h ${m % 60 ? `${m % 60} min` : ''}`.trim() : `${m} min`;

function JobCard(props: { title: string; facts: JobFacts; steps?: ComebackDetail['steps'] }) {
  const f = props.facts;
  const tz = f.shop.timeZone;
  const headingId = `job-card-${f.id}`;
  const unticked = props.steps?.filter((s) => !s.ticked) ?? [];
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <div className="flex flex-wrap items-center justify-between gap-2 border-b border-sand-200 px-5 py-4">
        <h2 id={headingId} className="text-lg font-semibold text-slate-900">
          {props.title}:{' '}
          {f.visible ? (
            <Link
              href={`/bench/jobs/${f.id}`}
              className="text-sea-700 underline underline-offset-2 hover:text-sea-900"
            >
              job #{f.id}
            </Link>
          ) : (
            `job #${f.id}`
          )}
        </h2>
        <StateBadge state={f.state as JobState} />
      </div>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-3 p-5">
        <Fact label="Shop">{f.shop.name}</Fact>
        <Fact label="Service">{SERVICE_LABELS[f.serviceType as keyof typeof SERVICE_LABELS]}</Fact>
        <Fact label="Technician">{f.technicianName ?? 'Unassigned'}</Fact>
        <Fact label="Bench time">{f.benchMinutes ? minutes(f.benchMinutes) : 'None logged'}</Fact>
        <Fact label="Checked in">{atTime(f.checkedInAt, tz)}</Fact>
        <Fact label={f.collectedAt ? 'Collected' : JOB_STATE_LABELS.ready}>
          {f.collectedAt
            ? atTime(f.collectedAt, tz)
            : f.readyAt
              ? atTime(f.readyAt, tz)
              : 'Not yet'}
        </Fact>
        <div className="col-span-2">
          <dt className="text-sm font-medium text-slate-600">What the customer said</dt>
          <dd className="mt-0.5 text-slate-900">{f.complaint ?? 'Not recorded'}</dd>
        </div>
        <div className="col-span-2">
          <dt className="text-sm font-medium text-slate-600">Findings</dt>
          <dd className="mt-0.5 whitespace-pre-line text-slate-900">
            {f.findings ?? 'None recorded'}
          </dd>
        </div>
        {props.steps && (
          <div className="col-span-2">
            <dt className="text-sm font-medium text-slate-600">Checklist</dt>
            <dd className="mt-0.5 text-slate-900">
              {props.steps.length === 0
                ? 'No checklist on record.'
                : unticked.length === 0
                  ? `All ${props.steps.length} steps ticked.`
                  : `${props.steps.length - unticked.length} of ${props.steps.length} steps ticked. Not ticked: ${unticked.map((s) => s.title).join('; ')}.`}
              {f.incompleteChecklistReason && (
                <span className="mt-1 block text-sm text-slate-700">
                  Marked ready without them because: {f.incompleteChecklistReason}
                </span>
              )}
            </dd>
          </div>
        )}
      </dl>
    </section>
  );
}

function RedoCost({ c }: { c: ComebackDetail }) {
  const r = c.redo;
  return (
    <Panel
      title="Cost of the redo"
      description="The return job's logged bench time at its shop's posted rate, plus its parts."
    >
      <table className="w-full text-left">
        <caption className="sr-only">How the cost of the redo is made up</caption>
        <tbody>
          <tr className="border-b border-sand-100">
            <th scope="row" className="py-2 pr-3 font-normal">
              Bench time: {minutes(r.benchMinutes)} × {formatMoney(r.labourRateCents)} an hour
            </th>
            <td className="num py-2">{formatMoney(r.labourCents)}</td>
          </tr>
          {r.parts.map((p, i) => (
            <tr key={i} className="border-b border-sand-100">
              <th scope="row" className="py-2 pr-3 font-normal">
                {p.name}: {p.quantity} × {formatMoney(p.unitPriceCents)}
              </th>
              <td className="num py-2">{formatMoney(p.lineCents)}</td>
            </tr>
          ))}
          {r.parts.length === 0 && (
            <tr className="border-b border-sand-100">
              <th scope="row" className="py-2 pr-3 font-normal">
                Parts
              </th>
              <td className="num py-2">{formatMoney(0)}</td>
            </tr>
          )}
          <tr>
            <th scope="row" className="py-2 pr-3 font-semibold">
              Redo cost
            </th>
            <td className="num py-2 font-semibold">{formatMoney(r.totalCents)}</td>
          </tr>
        </tbody>
      </table>
      {r.totalCents === 0 && (
        <p className="mt-3 text-sm text-slate-700">
          No bench time or parts are logged on the return job yet. Save the review again once the
          redo is done to store its cost.
        </p>
      )}
      <p className="mt-3 text-sm text-slate-700">
        {c.redoCostCents === null
          ? 'Stored with the review when it is confirmed.'
          : c.redoCostCents === r.totalCents
            ? `Stored with the review: ${formatMoney(c.redoCostCents)}.`
            : `Stored with the review: ${formatMoney(c.redoCostCents)}. The return job has changed since; saving the review again stores the figure above.`}
      </p>
    </Panel>
  );
}

function ReviewSummary({ c }: { c: ComebackDetail }) {
  return (
    <Panel
      title="Review"
      description={
        c.status === 'open'
          ? `Waiting for ${c.assignee?.name ?? `${c.originalJob.shopName}’s lead`}. You can read the review but not make it.`
          : 'You can read the review but not change it.'
      }
    >
      <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-2">
        <Fact label="Decision">
          {c.status === 'open'
            ? 'Not reviewed yet'
            : c.status === 'confirmed'
              ? 'Confirmed'
              : 'Dismissed'}
        </Fact>
        {c.status === 'dismissed' ? (
          <Fact label="Why">
            {c.dismissal.reason ? DISMISS_REASON_LABELS[c.dismissal.reason] : 'Not given'}
            {c.dismissal.note ? `: ${c.dismissal.note}` : ''}
          </Fact>
        ) : (
          <>
            <Fact label="Attribution">
              {c.attribution ? ATTRIBUTION_LABELS[c.attribution] : '—'}
            </Fact>
            <Fact label="Root cause">
              {c.rootCause ?? '—'}
              {c.rootCauseNote ? ` — ${c.rootCauseNote}` : ''}
            </Fact>
            <Fact label="Checklist step">{c.checklistStep?.title ?? '—'}</Fact>
            <Fact label="Disposition">
              {c.disposition ? DISPOSITION_LABELS[c.disposition] : '—'}
            </Fact>
          </>
        )}
      </dl>
    </Panel>
  );
}

const ACTION_WORDS: Record<string, string> = {
  'comeback.detect': 'Flagged at check-in',
  'comeback.link': 'Linked to the earlier job by hand',
  'comeback.confirm': 'Confirmed',
  'comeback.dismiss': 'Dismissed',
  'comeback.reopen': 'Reopened',
  'comeback.update': 'Review changed',
  'comeback.reassign': 'Review reassigned',
  'comeback.corrective_action': 'Corrective action opened',
};

/** What a logged change set, in words: attribution, dismissal, root cause, assignee. */
function historyDetail(after: unknown, c: ComebackDetail): string | null {
  if (!after || typeof after !== 'object') return null;
  const a = after as Record<string, unknown>;
  const parts: string[] = [];
  if (typeof a.attribution === 'string')
    parts.push(
      ATTRIBUTION_LABELS[a.attribution as keyof typeof ATTRIBUTION_LABELS] ?? a.attribution,
    );
  if (typeof a.dismissReason === 'string') parts.push(a.dismissReason);
  if (typeof a.rootCauseId === 'number') {
    const cause = c.rootCauses.find((r) => r.id === a.rootCauseId);
    if (cause) parts.push(cause.label);
  }
  if (typeof a.disposition === 'string')
    parts.push(
      DISPOSITION_LABELS[a.disposition as keyof typeof DISPOSITION_LABELS] ?? a.disposition,
    );
  if ('assigneeId' in a)
    parts.push(
      a.assigneeId === null
        ? 'Back with the shop lead'
        : `To ${c.reviewers.find((p) => p.id === a.assigneeId)?.name ?? 'another reviewer'}`,
    );
  if (typeof a.correctiveActionId === 'number') parts.push(`#${a.correctiveActionId}`);
  return parts.length ? parts.join(' · ') : null;
}

function History({ c }: { c: ComebackDetail }) {
  const tz = c.originalJob.timeZone;
  return (
    <Panel title="History">
      <ol className="space-y-2">
        {c.history.map((h) => (
          <li key={h.id} className="text-slate-800">
            <span className="font-medium">{ACTION_WORDS[h.action] ?? h.action}</span>
            {historyDetail(h.after, c) && (
              <span className="block text-slate-700">{historyDetail(h.after, c)}</span>
            )}
            <span className="block text-sm text-slate-600">
              {atTime(h.at, tz)}
              {h.userName ? ` · ${h.userName}` : ''}
            </span>
          </li>
        ))}
      </ol>
    </Panel>
  );
}
