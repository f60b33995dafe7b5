'use client';

import Link from 'next/link';
import { useEffect, useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { Panel } from '~/components/ui';
import { clientNow } from '~/lib/client-clock';
import { formatInZone } from '~/lib/format';
import { type JobDetailJson } from '~/lib/queries/jobs';
import { formatMinutes } from '../../../_components/format';
import { ErrorNote } from './error-note';
import { useJobMutation } from './use-job-mutation';

const clock = (ms: number) => {
  const s = Math.max(0, Math.floor(ms / 1000));
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${pad(Math.floor(s / 3600))}:${pad(Math.floor((s % 3600) / 60))}:${pad(s % 60)}`;
};

/** The caller's timer on this job, the minutes logged so far, and minutes entered by hand. */
export function BenchTimePanel({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const running = job.myRunningSince ? new Date(job.myRunningSince).getTime() : null;
  const [now, setNow] = useState(() => clientNow());
  const [minutes, setMinutes] = useState('');
  const [fieldError, setFieldError] = useState<string | null>(null);
  useEffect(() => {
    if (running === null) return;
    const timer = setInterval(() => setNow(clientNow()), 1000);
    return () => clearInterval(timer);
  }, [running]);

  const timer = useJobMutation(
    job.id,
    (action: 'start' | 'stop') =>
      sendJson<JobDetailJson>('POST', `/api/jobs/${job.id}/bench-sessions`, { action }),
    { scope: 'bench' },
  );
  const manual = useJobMutation(
    job.id,
    (value: number) =>
      sendJson<JobDetailJson>('POST', `/api/jobs/${job.id}/bench-sessions`, { minutes: value }),
    { scope: 'bench' },
  );
  const tz = job.shop.timeZone;
  const others = job.sessions.filter((s) => s.startedAt !== null && s.endedAt === null);

  return (
    <Panel
      title="Bench time"
      description={`${formatMinutes(job.benchMinutes)} logged on this job.`}
    >
      {running !== null && (
        <p className="mb-3 text-center">
          <span className="block text-sm font-medium text-slate-600">Your timer</span>
          <span
            className="block text-4xl font-semibold text-sea-800 tabular-nums"
            role="timer"
            aria-label={`Running for ${formatMinutes((now - running) / 60_000)}`}
          >
            {clock(now - running)}
          </span>
        </p>
      )}
      {canWrite && (
        <>
          {job.myTimerElsewhere !== null ? (
            <p className="rounded-md border border-brass-200 bg-brass-50 px-3 py-2 text-brass-900">
              Your timer is running on{' '}
              <Link
                href={`/bench/jobs/${job.myTimerElsewhere}`}
                className="font-semibold underline"
              >
                job #{job.myTimerElsewhere}
              </Link>
              . Stop it there to time this job.
            </p>
          ) : running !== null ? (
            <button
              type="button"
              onClick={() => timer.mutate('stop')}
              disabled={timer.isPending}
              className="flex min-h-14 w-full items-center justify-center rounded-md bg-brick-700 text-lg font-semibold text-white hover:bg-brick-800 disabled:opacity-70"
            >
              Stop timer
            </button>
          ) : job.state === 'on_bench' ? (
            <button
              type="button"
              onClick={() => timer.mutate('start')}
              disabled={timer.isPending}
              className="flex min-h-14 w-full items-center justify-center rounded-md bg-sea-700 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
            >
              Start timer
            </button>
          ) : (
            <p className="text-slate-700">The timer runs while the job is on the bench.</p>
          )}
          <ErrorNote error={timer.error} />
          <form
            className="mt-5 flex flex-wrap items-end gap-3"
            onSubmit={(e) => {
              e.preventDefault();
              const n = Number(minutes);
              if (!/^\d+$/.test(minutes.trim()) || n < 1 || n > 720) {
                setFieldError('Enter whole minutes from 1 to 720.');
                return;
              }
              setFieldError(null);
              manual.mutate(n, { onSuccess: () => setMinutes('') });
            }}
          >
            <div className="grow">
              <label htmlFor="manual-minutes" className="block font-medium text-slate-800">
                Add minutes by hand
              </label>
              <input
                id="manual-minutes"
                inputMode="numeric"
                value={minutes}
                onChange={(e) => setMinutes(e.target.value)}
                aria-invalid={fieldError ? true : undefined}
                aria-describedby={fieldError ? 'manual-minutes-error' : undefined}
                className="mt-1 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-lg aria-invalid:border-brick-600"
              />
            </div>
            <button
              type="submit"
              disabled={manual.isPending}
              className="inline-flex min-h-12 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50"
            >
              Add minutes
            </button>
          </form>
          {fieldError && (
            <p id="manual-minutes-error" className="mt-1 text-brick-700">
              {fieldError}
            </p>
          )}
          <ErrorNote error={manual.error} />
        </>
      )}
      {job.sessions.length > 0 && (
        <table className={`w-full text-left text-sm ${canWrite || running !== null ? 'mt-5' : ''}`}>
          <caption className="sr-only">Bench sessions on this job</caption>
          <thead>
            <tr className="border-b border-sand-300 text-slate-600">
              <th scope="col" className="py-1.5 pr-2 font-medium">
                Who
              </th>
              <th scope="col" className="py-1.5 pr-2 font-medium">
                When
              </th>
              <th scope="col" className="num py-1.5 font-medium">
                Time
              </th>
            </tr>
          </thead>
          <tbody>
            {job.sessions.map((s) => (
              <tr key={s.id} className="border-b border-sand-100">
                <td className="py-1.5 pr-2">{s.technicianName}</td>
                <td className="py-1.5 pr-2">
                  {s.startedAt
                    ? formatInZone(new Date(s.startedAt), tz, 'd MMM, HH:mm')
                    : `${formatInZone(new Date(s.createdAt), tz, 'd MMM')}, by hand`}
                </td>
                <td className="num py-1.5">
                  {s.minutes === null ? 'Running' : formatMinutes(s.minutes)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {others.length > 0 && running === null && (
        <p className="mt-3 text-sm text-slate-600">
          Timer running for {others.map((s) => s.technicianName).join(', ')}.
        </p>
      )}
    </Panel>
  );
}
