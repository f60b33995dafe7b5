import type { ReactNode } from 'react';
import { JOB_STATE_LABELS, type JobState } from '~/lib/labels';

export function PageHeader(props: { title: string; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-8 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-3xl font-semibold tracking-tight text-slate-900">{props.title}</h1>
        {props.lead && <p className="mt-2 max-w-3xl text-lg text-slate-600">{props.lead}</p>}
      </div>
      {props.actions}
    </div>
  );
}

export function Panel(props: {
  title: string;
  children: ReactNode;
  description?: string;
  id?: string;
}) {
  const headingId = props.id ?? `panel-${props.title.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <div className="border-b border-sand-200 px-5 py-4">
        <h2 id={headingId} className="text-lg font-semibold text-slate-900">
          {props.title}
        </h2>
        {props.description && <p className="mt-1 text-slate-600">{props.description}</p>}
      </div>
      <div className="p-5">{props.children}</div>
    </section>
  );
}

export function Stat(props: { label: string; value: ReactNode; hint?: string }) {
  return (
    <div className="rounded-lg border border-sand-200 bg-white px-5 py-4 shadow-sm">
      <dt className="text-sm font-medium text-slate-600">{props.label}</dt>
      <dd className="mt-1 text-3xl font-semibold text-slate-900 tabular-nums">{props.value}</dd>
      {props.hint && <dd className="mt-1 text-sm text-slate-600">{props.hint}</dd>}
    </div>
  );
}

const STATE_STYLES: Record<JobState, string> = {
  checked_in: 'bg-sand-100 text-slate-800 ring-sand-300',
  on_bench: 'bg-sea-50 text-sea-800 ring-sea-200',
  waiting_parts: 'bg-brass-50 text-brass-800 ring-brass-200',
  ready: 'bg-sea-700 text-white ring-sea-700',
  collected: 'bg-slate-100 text-slate-700 ring-slate-300',
};

export function StateBadge({ state }: { state: JobState }) {
  return (
    <span
      className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset ${STATE_STYLES[state]}`}
    >
      {JOB_STATE_LABELS[state]}
    </span>
  );
}

export function Empty({ children }: { children: ReactNode }) {
  return <p className="py-6 text-center text-slate-600">{children}</p>;
}

export function NotAllowed() {
  return (
    <div className="rounded-lg border border-sand-200 bg-white p-8">
      <h1 className="text-2xl font-semibold">Not available for your role</h1>
      <p className="mt-2 text-slate-600">
        This section is for other roles in the network. Use the sections in the bar above.
      </p>
    </div>
  );
}
