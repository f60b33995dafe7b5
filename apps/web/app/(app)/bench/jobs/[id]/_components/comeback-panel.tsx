'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useId, useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { formatInZone } from '~/lib/format';
import { SERVICE_LABELS } from '~/lib/labels';
import { comebackKeys, jobComebackQuery } from '~/lib/queries/comebacks';
import { jobKeys } from '~/lib/queries/jobs';
import { COMEBACK_STATUS_LABELS } from '~/lib/comebacks';
import { type ComebackLinkInput } from '~/lib/validators/comebacks';
import type { JobComeback } from '~/server/queries/comebacks';
import { problemText } from './use-job-mutation';

const days = (n: number) => (n === 1 ? '1 day' : `${n} days`);
const onDate = (iso: string | null, tz: string) =>
  iso ? formatInZone(new Date(iso), tz, 'd MMM yyyy') : '—';

/**
 * The job's comeback flag (back after an earlier job, with the days since it was collected and a
 * link to the review), later returns of this job's work, and the control to link it by hand.
 */
export function ComebackPanel(props: { jobId: number; timeZone: string }) {
  const { data } = useQuery(jobComebackQuery(props.jobId));
  if (!data) return null;
  const tz = props.timeZone;
  const flag = data.comeback;
  if (!flag && data.returns.length === 0 && !data.canLink) return null;
  return (
    <section
      aria-labelledby="comeback-heading"
      className={`rounded-lg border bg-white shadow-sm ${flag ? 'border-brass-400 border-l-8' : 'border-sand-200'}`}
    >
      <div className="px-5 py-4 sm:px-6">
        <h2 id="comeback-heading" className="text-lg font-semibold text-slate-900">
          {flag ? 'Possible comeback' : 'Comebacks'}
        </h2>
        {flag && (
          <div className="mt-1 space-y-1 text-slate-800">
            <p>
              Back <strong>{days(flag.daysSinceCollection)}</strong> after{' '}
              {flag.originalJob.visible ? (
                <Link
                  href={`/bench/jobs/${flag.originalJob.id}`}
                  className="text-sea-700 underline underline-offset-2"
                >
                  job #{flag.originalJob.id}
                </Link>
              ) : (
                `job #${flag.originalJob.id}`
              )}{' '}
              at {flag.originalJob.shopName} was collected (
              {onDate(flag.originalJob.collectedAt, tz)}
              ),{' '}
              {flag.insideWindow
                ? `inside the ${data.warrantyDays}-day warranty window`
                : `outside the ${data.warrantyDays}-day warranty window`}
              . {flag.detection === 'automatic' ? 'Flagged at check-in.' : 'Linked by hand.'}
            </p>
            <p>
              Review: {COMEBACK_STATUS_LABELS[flag.status].toLowerCase()}
              {flag.status === 'open' ? ` by ${flag.originalJob.shopName}’s lead` : ''}.{' '}
              {data.canReadReview && (
                <Link
                  href={`/comebacks/${flag.id}`}
                  className="font-medium text-sea-700 underline underline-offset-2"
                >
                  Open the review of comeback #{flag.id}
                </Link>
              )}
            </p>
          </div>
        )}
        {data.returns.length > 0 && (
          <ul className="mt-1 space-y-1 text-slate-800">
            {data.returns.map((r) => (
              <li key={r.id}>
                This job&apos;s work came back as job #{r.jobId} at {r.shopName} (
                {COMEBACK_STATUS_LABELS[r.status].toLowerCase()}).{' '}
                {data.canReadReview && (
                  <Link
                    href={`/comebacks/${r.id}`}
                    className="text-sea-700 underline underline-offset-2"
                  >
                    Comeback #{r.id}
                  </Link>
                )}
              </li>
            ))}
          </ul>
        )}
        {data.canLink && <LinkForm jobId={props.jobId} data={data} timeZone={tz} />}
      </div>
    </section>
  );
}

function LinkForm(props: { jobId: number; data: JobComeback; timeZone: string }) {
  const id = useId();
  const queryClient = useQueryClient();
  const [open, setOpen] = useState(false);
  const [choice, setChoice] = useState<number | null>(null);
  const [symptom, setSymptom] = useState('');
  const link = useMutation({
    mutationFn: (body: ComebackLinkInput) =>
      sendJson<JobComeback>('POST', `/api/jobs/${props.jobId}/comeback-of`, body),
    onSuccess: (next) => {
      queryClient.setQueryData(comebackKeys.job(props.jobId), next);
      void queryClient.invalidateQueries({ queryKey: jobKeys.detail(props.jobId) });
      void queryClient.invalidateQueries({ queryKey: comebackKeys.lists });
    },
  });
  if (!open)
    return (
      <div className="mt-1">
        <p className="text-slate-700">
          Not flagged at check-in. If the customer brought it back for the same fault as an earlier
          job, link the two so the shop that did the work reviews it.
        </p>
        <button
          type="button"
          onClick={() => setOpen(true)}
          aria-expanded={false}
          className="mt-3 inline-flex min-h-11 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50"
        >
          Link to an earlier job
        </button>
      </div>
    );
  return (
    <form
      className="mt-3 space-y-4"
      onSubmit={(e) => {
        e.preventDefault();
        if (choice === null) return;
        link.mutate({ originalJobId: choice, symptom: symptom.trim() || null });
      }}
    >
      <fieldset>
        <legend className="font-medium text-slate-900">
          Which earlier job of this reel came back?
        </legend>
        <div className="mt-2 grid gap-2 md:grid-cols-2">
          {props.data.candidates.map((c) => (
            <label
              key={c.id}
              className="flex min-h-12 cursor-pointer items-start gap-3 rounded-md border border-sand-300 bg-white px-4 py-2.5 has-checked:border-sea-700 has-checked:bg-sea-50 has-checked:ring-1 has-checked:ring-sea-700"
            >
              <input
                type="radio"
                name={`${id}-job`}
                checked={choice === c.id}
                onChange={() => setChoice(c.id)}
                className="mt-1 size-5 shrink-0 accent-sea-700"
              />
              <span>
                <span className="block font-medium">
                  Job #{c.id} · {SERVICE_LABELS[c.serviceType as keyof typeof SERVICE_LABELS]} at{' '}
                  {c.shopName}
                </span>
                <span className="block text-sm text-slate-700">
                  Collected {onDate(c.collectedAt, props.timeZone)}, {days(c.daysBefore)} before
                  this check-in
                  {c.insideWindow ? '' : ' (outside the warranty window)'}
                </span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>
      <div>
        <label htmlFor={`${id}-symptom`} className="block font-medium text-slate-800">
          What the customer reports this time (optional)
        </label>
        <input
          id={`${id}-symptom`}
          value={symptom}
          onChange={(e) => setSymptom(e.target.value)}
          className="mt-1 block min-h-11 w-full max-w-2xl rounded-md border border-slate-400 bg-white px-3"
        />
      </div>
      <div className="flex flex-wrap gap-3">
        <button
          type="submit"
          disabled={choice === null || link.isPending}
          className="inline-flex min-h-11 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
        >
          Link as a comeback
        </button>
        <button
          type="button"
          onClick={() => setOpen(false)}
          className="inline-flex min-h-11 items-center rounded-md border border-slate-400 bg-white px-4 font-medium hover:bg-sand-100"
        >
          Cancel
        </button>
      </div>
      <div aria-live="polite">
        {link.isError && (
          <p role="alert" className="font-medium text-brick-700">
            Not linked: {problemText(link.error)}
          </p>
        )}
      </div>
    </form>
  );
}
