'use client';

import { useQuery } from '@tanstack/react-query';
import { sendJson } from '~/lib/api-client';
import { clientNow } from '~/lib/client-clock';
import Link from 'next/link';
import { useState, type ReactNode } from 'react';
import { StateBadge } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { JOB_STATE_LABELS, REEL_KIND_LABELS, SERVICE_LABELS, type JobState } from '~/lib/labels';
import { jobDetailQuery, type JobDetailJson } from '~/lib/queries/jobs';
import { formatCivilDate, moveLabel, USE_LABELS, WATER_LABELS } from '../../../_components/format';
import { BenchTimePanel } from './bench-time-panel';
import { ChecklistPanel } from './checklist-panel';
import { ComebackPanel } from './comeback-panel';
import { ErrorNote } from './error-note';
import { MoneyPanel } from './money-panel';
import { NotesPanel } from './notes-panel';
import { PartsPanel } from './parts-panel';
import { PhotosSlot } from './photos-slot';
import { TimelinePanel } from './timeline-panel';
import { useJobMutation } from './use-job-mutation';

export function JobView({ id, canWrite }: { id: number; canWrite: boolean }) {
  const { data: job, isError, error } = useQuery(jobDetailQuery(id));
  if (!job)
    return (
      <p role={isError ? 'alert' : undefined} className="text-slate-700">
        {isError ? `Could not load the job: ${error.message}` : 'Loading the job…'}
      </p>
    );
  const writable = canWrite && job.state !== 'collected';
  return (
    <div className="space-y-6">
      <JobHeader job={job} canWrite={canWrite} />
      <ComebackPanel jobId={job.id} timeZone={job.shop.timeZone} />
      <div className="grid items-start gap-6 lg:grid-cols-[minmax(0,1.6fr)_minmax(0,1fr)]">
        <div className="space-y-6">
          <ChecklistPanel job={job} canWrite={writable} />
        </div>
        <div className="space-y-6">
          <BenchTimePanel job={job} canWrite={writable} />
          <PartsPanel job={job} canWrite={writable} />
          <MoneyPanel job={job} canWrite={writable} />
          <NotesPanel job={job} canWrite={writable} />
          <TimelinePanel job={job} />
          <PhotosSlot jobId={job.id} canUpload={writable} />
        </div>
      </div>
    </div>
  );
}

const when = (iso: string, tz: string) => formatInZone(new Date(iso), tz, 'EEE d MMM yyyy, HH:mm');

function JobHeader({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const tz = job.shop.timeZone;
  const [asking, setAsking] = useState(false);
  const [reason, setReason] = useState('');
  const move = useJobMutation(job.id, (body: { to: JobState; reason?: string }) =>
    sendJson<JobDetailJson>('POST', `/api/jobs/${job.id}/transitions`, body),
  );
  const assign = useJobMutation(job.id, (technicianId: number | null) =>
    sendJson<JobDetailJson>('PATCH', `/api/jobs/${job.id}`, { technicianId }),
  );
  const promise = useJobMutation(job.id, (promisedOn: string) =>
    sendJson<JobDetailJson>('PATCH', `/api/jobs/${job.id}`, { promisedOn }),
  );
  const late =
    job.promisedAt !== null &&
    job.readyAt === null &&
    new Date(job.promisedAt).getTime() < clientNow();
  const unticked = job.checklist.requiredUnticked;

  const onMove = (to: JobState) => {
    if (to === 'ready' && unticked > 0) {
      setAsking(true);
      return;
    }
    move.mutate({ to });
  };

  return (
    <header className="rounded-lg border border-sand-200 bg-white shadow-sm">
      <div className="flex flex-wrap items-start justify-between gap-4 p-5 sm:p-6">
        <div>
          <p className="text-sm font-medium text-slate-600">
            <Link href="/bench" className="text-sea-700 underline underline-offset-2">
              Bench
            </Link>{' '}
            · {job.shop.name}
          </p>
          <h1 className="mt-1 flex flex-wrap items-center gap-3 text-3xl font-semibold tracking-tight text-slate-900">
            Job #{job.id}
            <StateBadge state={job.state} />
          </h1>
          <p className="mt-2 text-lg text-slate-700">
            <span className="font-medium text-slate-900">{job.customer.name}</span> ·{' '}
            {job.reel.maker} {job.reel.model} {job.reel.size} · {SERVICE_LABELS[job.serviceType]}
          </p>
          {job.comebackOfJobId !== null && (
            <p className="mt-1 text-brass-800">
              Came back after{' '}
              <a href="#comeback-heading" className="underline">
                job #{job.comebackOfJobId}
              </a>
            </p>
          )}
        </div>
        {canWrite && job.nextStates.length > 0 && (
          <div className="flex flex-wrap gap-3" role="group" aria-label="Move the job">
            {job.nextStates.map((to) => (
              <button
                key={to}
                type="button"
                disabled={move.isPending}
                onClick={() => onMove(to)}
                className={`inline-flex min-h-14 items-center rounded-md px-6 text-lg font-semibold disabled:opacity-70 ${
                  to === 'waiting_parts'
                    ? 'border border-brass-600 bg-brass-50 text-brass-900 hover:bg-brass-100'
                    : 'bg-sea-700 text-white hover:bg-sea-800'
                }`}
              >
                {moveLabel(job.state, to)}
              </button>
            ))}
          </div>
        )}
      </div>
      {canWrite && asking && job.nextStates.includes('ready') && (
        <form
          className="border-t border-amber-200 bg-amber-50 px-5 py-4 sm:px-6"
          onSubmit={(e) => {
            e.preventDefault();
            move.mutate(
              { to: 'ready', reason },
              {
                onSuccess: () => {
                  setAsking(false);
                  setReason('');
                },
              },
            );
          }}
        >
          <label htmlFor="ready-reason" className="block font-semibold text-amber-950">
            {unticked === 1
              ? '1 required checklist step is not ticked.'
              : `${unticked} required checklist steps are not ticked.`}{' '}
            Say why the reel is ready without them:
          </label>
          <textarea
            id="ready-reason"
            rows={2}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            className="mt-2 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-lg"
          />
          <div className="mt-3 flex flex-wrap gap-3">
            <button
              type="submit"
              disabled={move.isPending || reason.trim() === ''}
              className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
            >
              Mark ready with this reason
            </button>
            <button
              type="button"
              onClick={() => setAsking(false)}
              className="inline-flex min-h-12 items-center rounded-md border border-slate-400 bg-white px-5 font-medium hover:bg-sand-100"
            >
              Back to the checklist
            </button>
          </div>
        </form>
      )}
      <div className="px-5 sm:px-6">
        <ErrorNote error={move.error ?? assign.error ?? promise.error} />
      </div>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-4 border-t border-sand-200 p-5 sm:p-6 md:grid-cols-4">
        <Fact label="Checked in">{when(job.checkedInAt, tz)}</Fact>
        <Fact label="Promised for">
          {canWrite && job.readyAt === null ? (
            <PromiseEditor
              key={job.promisedOn}
              value={job.promisedOn ?? ''}
              saving={promise.isPending}
              onSave={(v) => promise.mutate(v)}
            />
          ) : job.promisedAt ? (
            formatInZone(new Date(job.promisedAt), tz, 'EEE d MMM yyyy')
          ) : (
            'Not set'
          )}
          {late && (
            <span className="ml-2 rounded bg-brick-50 px-1.5 text-sm font-medium text-brick-800 ring-1 ring-brick-200 ring-inset">
              Late
            </span>
          )}
        </Fact>
        <Fact label="Technician">
          {canWrite ? (
            <>
              <label htmlFor="job-technician" className="sr-only">
                Technician
              </label>
              <select
                id="job-technician"
                value={job.technician?.id ?? ''}
                onChange={(e) => assign.mutate(e.target.value ? Number(e.target.value) : null)}
                className="min-h-11 w-full max-w-56 rounded-md border border-slate-400 bg-white px-2"
              >
                <option value="">Unassigned</option>
                {job.technicians.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name}
                  </option>
                ))}
              </select>
            </>
          ) : (
            (job.technician?.name ?? 'Unassigned')
          )}
        </Fact>
        <Fact label={`${JOB_STATE_LABELS[job.state]} since`}>{when(job.stateChangedAt, tz)}</Fact>
        <Fact label="Customer">
          <span className="block">{job.customer.phone ?? 'No phone'}</span>
          <span className="block break-all">{job.customer.email ?? 'No e-mail'}</span>
        </Fact>
        <Fact label="Reel">
          {REEL_KIND_LABELS[job.reel.kind as keyof typeof REEL_KIND_LABELS]}
          {job.reel.gearRatio ? `, ${job.reel.gearRatio}` : ''}
          {job.reel.bearingCount !== null ? `, ${job.reel.bearingCount} bearings` : ''}
        </Fact>
        <Fact label="Use">
          {WATER_LABELS[job.reel.water]}, {USE_LABELS[job.reel.useProfile]?.toLowerCase()}
        </Fact>
        <Fact label="Last serviced">
          {job.reel.lastServicedOn
            ? formatCivilDate(job.reel.lastServicedOn)
            : 'Not with us before'}
        </Fact>
      </dl>
    </header>
  );
}

function PromiseEditor(props: { value: string; saving: boolean; onSave: (value: string) => void }) {
  const [value, setValue] = useState(props.value);
  return (
    <form
      className="flex flex-wrap items-center gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (value) props.onSave(value);
      }}
    >
      <label htmlFor="promised-on" className="sr-only">
        Promised date
      </label>
      <input
        id="promised-on"
        type="date"
        value={value}
        onChange={(e) => setValue(e.target.value)}
        className="min-h-11 rounded-md border border-slate-400 bg-white px-2"
      />
      {value !== props.value && value !== '' && (
        <button
          type="submit"
          disabled={props.saving}
          className="min-h-11 rounded-md bg-sea-700 px-3 font-semibold text-white hover:bg-sea-800"
        >
          Save date
        </button>
      )}
    </form>
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
