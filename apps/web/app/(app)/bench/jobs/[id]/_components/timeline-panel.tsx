import { Panel } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { JOB_STATE_LABELS } from '~/lib/labels';
import type { JobDetailJson } from '~/lib/queries/jobs';
import { formatMinutes } from '../../../_components/format';

/** Every state change with who made it and when, and the turnaround once the job was ready. */
export function TimelinePanel({ job }: { job: JobDetailJson }) {
  const tz = job.shop.timeZone;
  return (
    <Panel title="Timeline">
      <ol className="relative space-y-4 border-l-2 border-sand-300 pl-5">
        {job.events.map((e) => (
          <li key={e.id} className="relative">
            <span
              aria-hidden="true"
              className="absolute top-1.5 -left-[1.7rem] size-3 rounded-full bg-sea-700 ring-4 ring-white"
            />
            <p className="font-semibold text-slate-900">{JOB_STATE_LABELS[e.toState]}</p>
            <p className="text-slate-700">
              <time dateTime={e.at}>
                {formatInZone(new Date(e.at), tz, 'EEE d MMM yyyy, HH:mm')}
              </time>
              {e.userName ? ` · ${e.userName}` : ''}
            </p>
            {e.note && <p className="text-slate-700">{e.note}</p>}
          </li>
        ))}
      </ol>
      {job.turnaround && (
        <div className="mt-5 border-t border-sand-200 pt-4">
          <p className="font-semibold text-slate-900">Turnaround in opening hours</p>
          <dl className="mt-2 space-y-1">
            <div className="flex justify-between gap-3">
              <dt>Check-in to ready</dt>
              <dd className="num">{formatMinutes(job.turnaround.customerMinutes)}</dd>
            </div>
            <div className="flex justify-between gap-3">
              <dt>Waiting on parts</dt>
              <dd className="num">{formatMinutes(job.turnaround.waitingPartsMinutes)}</dd>
            </div>
            <div className="flex justify-between gap-3">
              <dt>Bench turnaround</dt>
              <dd className="num">{formatMinutes(job.turnaround.benchMinutes)}</dd>
            </div>
          </dl>
        </div>
      )}
    </Panel>
  );
}
