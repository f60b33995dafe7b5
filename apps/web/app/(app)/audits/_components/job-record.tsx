import type { ReactNode } from 'react';
import { JOB_STATE_LABELS, REEL_KIND_LABELS, SERVICE_LABELS, type JobState } from '~/lib/labels';
import type { JobRecord as Record } from '~/server/queries/audits';
import { formatCents, formatInstant, formatMinutes, formLabel } from './format';

const STAGE_LABELS: { [k: string]: string } = {
  check_in: 'At check-in',
  teardown: 'At teardown',
  reassembly: 'Reassembled',
};

function Section(props: { title: string; children: ReactNode; id: string }) {
  return (
    <section
      aria-labelledby={props.id}
      className="border-t border-sand-200 pt-5 first:border-t-0 first:pt-0"
    >
      <h3 id={props.id} className="text-lg font-semibold text-slate-900">
        {props.title}
      </h3>
      <div className="mt-2">{props.children}</div>
    </section>
  );
}

const label = (map: { [k: string]: string }, key: string) => map[key] ?? key;

/** A job's record as the auditor reads it: everything the bench wrote, nothing to edit. */
export function JobRecordView({ job, timeZone }: { job: Record; timeZone: string }) {
  const at = (iso: string | null) => (iso ? formatInstant(iso, timeZone) : '—');
  const required = job.checklist.steps.filter((s) => s.required);
  const requiredUnticked = required.filter((s) => !s.ticked).length;
  const benchCharge = Math.round((job.bench.minutes * job.money.labourRateCents) / 60);
  return (
    <div className="space-y-6">
      <Section title="Reel and check-in" id={`job-${job.id}-checkin`}>
        <dl className="grid grid-cols-[max-content_minmax(0,1fr)] gap-x-6 gap-y-1.5">
          <dt className="text-slate-600">Reel</dt>
          <dd>
            {job.reel.maker} {job.reel.model}
            {job.reel.size ? `, size ${job.reel.size}` : ''} (
            {label(REEL_KIND_LABELS, job.reel.kind)})
          </dd>
          <dt className="text-slate-600">Details</dt>
          <dd>
            {[
              job.reel.bearingCount !== null ? `${job.reel.bearingCount} bearings` : null,
              job.reel.gearRatio ? `gear ratio ${job.reel.gearRatio}` : null,
              job.reel.useProfile === 'heavy' ? 'heavy use' : 'light use',
              job.reel.water === 'salt' ? 'saltwater' : 'freshwater',
            ]
              .filter(Boolean)
              .join(', ')}
          </dd>
          <dt className="text-slate-600">Service</dt>
          <dd>{label(SERVICE_LABELS, job.serviceType)}</dd>
          <dt className="text-slate-600">Technician</dt>
          <dd>{job.technicianName ?? 'Not assigned'}</dd>
          <dt className="text-slate-600">Checked in</dt>
          <dd>{at(job.checkedInAt)}</dd>
          <dt className="text-slate-600">Promised</dt>
          <dd>{at(job.promisedAt)}</dd>
          <dt className="text-slate-600">Ready</dt>
          <dd>{at(job.readyAt)}</dd>
          <dt className="text-slate-600">Complaint</dt>
          <dd>{job.complaint || <span className="text-slate-600">Not recorded</span>}</dd>
          <dt className="text-slate-600">Condition</dt>
          <dd>{job.condition || <span className="text-slate-600">Not recorded</span>}</dd>
          {job.comebackOfJobId && (
            <>
              <dt className="text-slate-600">Comeback of</dt>
              <dd>Job #{job.comebackOfJobId}</dd>
            </>
          )}
        </dl>
        <p className="mt-2 text-sm text-slate-600">
          Customer contact details are not shown in audits.
        </p>
      </Section>

      <Section title="Photos" id={`job-${job.id}-photos`}>
        {job.photos.length === 0 ? (
          <p className="text-slate-700">No photos were uploaded for this job.</p>
        ) : job.photosViewable ? (
          <div className="space-y-4">
            {job.photos.map((p) => (
              <figure key={p.id}>
                {p.url ? (
                  // Served by the app's photo route, access checked per request: next/image would bypass that.
                  // eslint-disable-next-line @next/next/no-img-element
                  <img
                    src={p.url}
                    alt={`${label(STAGE_LABELS, p.stage)}: ${p.caption ?? p.name}`}
                    width={p.width ?? undefined}
                    height={p.height ?? undefined}
                    className="h-auto w-full rounded-md border border-sand-200 bg-sand-100"
                  />
                ) : (
                  <p className="text-brick-700">This photo could not be loaded from storage.</p>
                )}
                <figcaption className="mt-1 text-sm text-slate-700">
                  {label(STAGE_LABELS, p.stage)} · {p.caption ?? p.name}
                </figcaption>
              </figure>
            ))}
          </div>
        ) : (
          <>
            <p className="text-slate-700">
              Photo storage is not configured on this server, so the photos are listed by name.
            </p>
            <ul className="mt-2 list-disc pl-5">
              {job.photos.map((p) => (
                <li key={p.id}>
                  {label(STAGE_LABELS, p.stage)}: {p.name}
                  {p.caption ? ` — ${p.caption}` : ''}
                </li>
              ))}
            </ul>
          </>
        )}
      </Section>

      <Section title="Timeline" id={`job-${job.id}-timeline`}>
        <ol className="space-y-1.5">
          {job.events.map((e) => (
            <li key={e.id}>
              <span className="font-medium">{label(JOB_STATE_LABELS, e.toState as JobState)}</span>{' '}
              <span className="text-slate-700">
                {at(e.at)}
                {e.userName ? ` · ${e.userName}` : ''}
              </span>
              {e.note && <span className="block text-sm text-slate-700">{e.note}</span>}
            </li>
          ))}
        </ol>
      </Section>

      <Section title="Bench time" id={`job-${job.id}-bench`}>
        <p>
          <strong>{formatMinutes(job.bench.minutes)}</strong> logged in {job.bench.sessions.length}{' '}
          {job.bench.sessions.length === 1 ? 'session' : 'sessions'}.
        </p>
        {job.bench.sessions.length > 0 && (
          <ul className="mt-1 text-sm text-slate-700">
            {job.bench.sessions.map((s) => (
              <li key={s.id}>
                {s.technicianName}: {s.minutes === null ? 'running' : formatMinutes(s.minutes)}
                {s.startedAt ? ` from ${at(s.startedAt)}` : ' (entered by hand)'}
                {s.note ? ` — ${s.note}` : ''}
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Checklist" id={`job-${job.id}-checklist`}>
        {job.checklist.standard ? (
          <p className="text-sm text-slate-700">
            {formLabel(job.checklist.standard.title, job.checklist.standard.version)}:{' '}
            {job.checklist.steps.filter((s) => s.ticked).length} of {job.checklist.steps.length}{' '}
            steps ticked;{' '}
            {requiredUnticked === 0
              ? 'every required step ticked'
              : `${requiredUnticked} required not ticked`}
            .
          </p>
        ) : (
          <p className="text-slate-700">The job was not checked in under a service standard.</p>
        )}
        {job.incompleteChecklistReason && (
          <p className="mt-2 rounded-md border border-amber-300 bg-amber-50 p-2 text-amber-900">
            Reason given for unticked steps: {job.incompleteChecklistReason}
          </p>
        )}
        {job.checklist.steps.length > 0 && (
          <table className="mt-2 w-full text-left text-sm">
            <caption className="sr-only">Checklist steps of job #{job.id}</caption>
            <thead>
              <tr className="border-b border-sand-300 text-slate-600">
                <th scope="col" className="py-1.5 pr-3 font-medium">
                  Step
                </th>
                <th scope="col" className="py-1.5 pr-3 font-medium">
                  Ticked
                </th>
              </tr>
            </thead>
            <tbody>
              {job.checklist.steps.map((s) => (
                <tr key={s.id} className="border-b border-sand-100 align-top">
                  <th scope="row" className="py-1.5 pr-3 font-normal">
                    {s.title}
                    {!s.required && <span className="text-slate-600"> (optional)</span>}
                    {s.note && <span className="block text-slate-700">{s.note}</span>}
                  </th>
                  <td
                    className={`py-1.5 pr-3 whitespace-nowrap ${s.ticked ? 'text-sea-800' : s.required ? 'font-semibold text-brick-700' : 'text-slate-600'}`}
                  >
                    {s.ticked ? `Yes${s.tickedBy ? `, ${s.tickedBy}` : ''}` : 'Not ticked'}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Section>

      <Section title="Findings" id={`job-${job.id}-findings`}>
        <p className="whitespace-pre-line">
          {job.findings || <span className="text-slate-600">No findings written.</span>}
        </p>
      </Section>

      <Section title="Parts" id={`job-${job.id}-parts`}>
        {job.parts.length === 0 ? (
          <p className="text-slate-700">No parts recorded.</p>
        ) : (
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Parts fitted to job #{job.id}</caption>
            <thead>
              <tr className="border-b border-sand-300 text-slate-600">
                <th scope="col" className="py-1.5 pr-3 font-medium">
                  Part
                </th>
                <th scope="col" className="num py-1.5 pr-3 font-medium">
                  Qty
                </th>
                <th scope="col" className="num py-1.5 font-medium">
                  Line
                </th>
              </tr>
            </thead>
            <tbody>
              {job.parts.map((p) => (
                <tr key={p.id} className="border-b border-sand-100">
                  <th scope="row" className="py-1.5 pr-3 font-normal">
                    {p.name}
                    <span className="block text-slate-600">{p.partNumber ?? 'No part number'}</span>
                  </th>
                  <td className="num py-1.5 pr-3">{p.quantity}</td>
                  <td className="num py-1.5">{formatCents(p.quantity * p.unitPriceCents)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Section>

      <Section title="Labour and total" id={`job-${job.id}-money`}>
        <dl className="grid max-w-sm grid-cols-[minmax(0,1fr)_max-content] gap-x-6 gap-y-1">
          <dt>Labour</dt>
          <dd className="num">{formatCents(job.money.labourCents)}</dd>
          <dt>Parts</dt>
          <dd className="num">{formatCents(job.money.partsCents)}</dd>
          <dt>Discount</dt>
          <dd className="num">−{formatCents(job.money.discountCents)}</dd>
          <dt className="font-semibold">Total</dt>
          <dd className="num font-semibold">{formatCents(job.money.totalCents)}</dd>
        </dl>
        <p className="mt-2 text-sm text-slate-700">
          Part lines add up to {formatCents(job.money.partLinesCents)}. Bench time at the posted
          rate ({formatCents(job.money.labourRateCents)} an hour) comes to{' '}
          {formatCents(benchCharge)}.
        </p>
      </Section>
    </div>
  );
}
