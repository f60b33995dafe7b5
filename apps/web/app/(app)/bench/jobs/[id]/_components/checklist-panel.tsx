'use client';

import { useRef, useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { Panel } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { type JobDetailJson } from '~/lib/queries/jobs';
import { STEP_GROUP_LABELS } from '../../../_components/format';
import { ErrorNote } from './error-note';
import { useJobMutation } from './use-job-mutation';

const DEFAULT_SAFETY =
  'Degreasers and solvents, springs under tension, hooks left on a reel, grease on skin, ' +
  'compressed air and line under load can hurt people: wear gloves and eye protection, keep ' +
  'solvents away from flames and heat, and wash your hands after work. The product’s safety ' +
  'data sheets, local regulations and licensed practice come first.';

function SafetyNotice({ text }: { text: string | null }) {
  return (
    <aside
      aria-label="Safety"
      className="mb-5 rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-amber-950"
    >
      <p className="font-semibold">Safety</p>
      <p className="mt-1">{text ?? DEFAULT_SAFETY}</p>
    </aside>
  );
}

/**
 * The checklist of the standard version the job was checked in under, grouped as the standard
 * groups it, with each step's safety caution beside it. Ticks save at once; they are sent one
 * after another so the last tick always wins.
 */
export function ChecklistPanel({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const { checklist } = job;
  const steps = checklist.groups.flatMap((g) => g.steps);
  const latest = useRef(0);
  // What the technician just ticked shows at once; the server's answer to the last tick replaces it.
  const [shown, setShown] = useState<number[] | null>(null);
  const save = useJobMutation(
    job.id,
    ({ stepIds }: { stepIds: number[]; seq: number }) =>
      sendJson<JobDetailJson>('PUT', `/api/jobs/${job.id}/checklist`, { stepIds }),
    // Quick ticks queue up; only the answer to the last one replaces what is on screen.
    { scope: 'checklist', isLatest: ({ seq }) => seq === latest.current },
  );
  const isTicked = (step: { id: number; ticked: boolean }) =>
    shown ? shown.includes(step.id) : step.ticked;
  const toggle = (stepId: number, on: boolean) => {
    const ids = steps.filter((s) => (s.id === stepId ? on : isTicked(s))).map((s) => s.id);
    setShown(ids);
    latest.current += 1;
    save.mutate(
      { stepIds: ids, seq: latest.current },
      { onSettled: (_job, _error, { seq }) => seq === latest.current && setShown(null) },
    );
  };
  const ticked = steps.filter(isTicked).length;
  const requiredLeft = steps.filter((s) => s.required && !isTicked(s)).length;

  if (!checklist.standard)
    return (
      <Panel title="Service checklist">
        <SafetyNotice text={null} />
        <p className="text-slate-700">
          This job was recorded without a service standard (for example, imported from another
          system), so it has no checklist.
        </p>
      </Panel>
    );

  return (
    <Panel
      title="Service checklist"
      description={`${checklist.standard.title}. ${ticked} of ${steps.length} steps ticked${
        requiredLeft > 0
          ? `; ${requiredLeft} required ${requiredLeft === 1 ? 'step' : 'steps'} left.`
          : '; every required step is done.'
      }`}
    >
      <SafetyNotice text={checklist.standard.safetyNotice} />
      {job.incompleteChecklistReason && (
        <p className="mb-5 rounded-md border border-brass-200 bg-brass-50 px-4 py-3 text-brass-900">
          <span className="font-semibold">Marked ready with steps unticked:</span>{' '}
          {job.incompleteChecklistReason}
        </p>
      )}
      <div className="@container space-y-6">
        {checklist.groups.map((group) => (
          <fieldset key={group.group}>
            <legend className="text-base font-semibold tracking-wide text-slate-700 uppercase">
              {STEP_GROUP_LABELS[group.group] ?? group.group}
            </legend>
            <ul className="mt-2 divide-y divide-sand-200 rounded-md border border-sand-200">
              {group.steps.map((step) => (
                <li
                  key={step.id}
                  className={`gap-4 px-3 py-2 ${step.safetyCaution ? '@xl:grid @xl:grid-cols-[minmax(0,1fr)_17rem]' : ''}`}
                >
                  <div className="flex items-start gap-3">
                    {canWrite ? (
                      <input
                        id={`step-${step.id}`}
                        type="checkbox"
                        checked={isTicked(step)}
                        onChange={(e) => toggle(step.id, e.target.checked)}
                        aria-describedby={
                          step.safetyCaution ? `step-${step.id}-caution` : undefined
                        }
                        className="mt-2.5 size-7 shrink-0 accent-sea-700"
                      />
                    ) : (
                      <span
                        aria-hidden="true"
                        className={`mt-2 inline-flex size-7 shrink-0 items-center justify-center rounded border text-lg ${
                          step.ticked
                            ? 'border-sea-700 bg-sea-700 text-white'
                            : 'border-slate-400 bg-white'
                        }`}
                      >
                        {step.ticked ? '✓' : ''}
                      </span>
                    )}
                    <div className="min-h-12 py-1.5">
                      {canWrite ? (
                        <label
                          htmlFor={`step-${step.id}`}
                          className="cursor-pointer text-lg font-medium"
                        >
                          {step.title}
                        </label>
                      ) : (
                        <p className="text-lg font-medium">
                          {step.title}
                          <span className="sr-only">{step.ticked ? ' (done)' : ' (not done)'}</span>
                        </p>
                      )}
                      <span
                        className={`ml-2 rounded px-1.5 py-0.5 text-xs font-semibold uppercase ${
                          step.required ? 'bg-sea-50 text-sea-800' : 'bg-sand-100 text-slate-700'
                        }`}
                      >
                        {step.required ? 'Required' : 'Optional'}
                      </span>
                      {step.instructions && (
                        <p className="mt-0.5 text-slate-700">{step.instructions}</p>
                      )}
                      {step.ticked && step.tickedAt && (
                        <p className="mt-0.5 text-sm text-slate-600">
                          Ticked {step.tickedBy ? `by ${step.tickedBy}, ` : ''}
                          {formatInZone(new Date(step.tickedAt), job.shop.timeZone, 'd MMM, HH:mm')}
                        </p>
                      )}
                    </div>
                  </div>
                  {step.safetyCaution && (
                    <p
                      id={`step-${step.id}-caution`}
                      className="mt-1 mb-1 ml-10 rounded-md border-l-4 border-amber-500 bg-amber-50 px-3 py-2 text-amber-950 @xl:mt-1 @xl:ml-0 @xl:self-start"
                    >
                      <span className="font-semibold">Caution: </span>
                      {step.safetyCaution}
                    </p>
                  )}
                </li>
              ))}
            </ul>
          </fieldset>
        ))}
      </div>
      <ErrorNote error={save.error} />
    </Panel>
  );
}
