'use client';

import { useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { Panel } from '~/components/ui';
import { type JobDetailJson } from '~/lib/queries/jobs';
import { ErrorNote } from './error-note';
import { useJobMutation } from './use-job-mutation';

type Notes = { complaint: string; condition: string; findings: string };

const fields: { key: keyof Notes; label: string; hint?: string }[] = [
  { key: 'complaint', label: 'What the customer says' },
  { key: 'condition', label: 'Condition at check-in' },
  {
    key: 'findings',
    label: 'Findings',
    hint: 'What you found and did: a cracked handle cap, a chipped tooth, seized bearings.',
  },
];

export function NotesPanel({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const saved: Notes = {
    complaint: job.complaint ?? '',
    condition: job.condition ?? '',
    findings: job.findings ?? '',
  };
  const [notes, setNotes] = useState(saved);
  const save = useJobMutation(job.id, (body: Notes) =>
    sendJson<JobDetailJson>('PATCH', `/api/jobs/${job.id}`, body),
  );
  const dirty = fields.some(({ key }) => notes[key] !== saved[key]);

  if (!canWrite)
    return (
      <Panel title="Notes and findings">
        <dl className="space-y-4">
          {fields.map(({ key, label }) => (
            <div key={key}>
              <dt className="font-medium text-slate-600">{label}</dt>
              <dd className="mt-0.5 whitespace-pre-line text-slate-900">
                {saved[key] || <span className="text-slate-600">Nothing recorded.</span>}
              </dd>
            </div>
          ))}
        </dl>
      </Panel>
    );

  return (
    <Panel title="Notes and findings">
      <form
        onSubmit={(e) => {
          e.preventDefault();
          save.mutate(notes);
        }}
        className="space-y-4"
      >
        {fields.map(({ key, label, hint }) => (
          <div key={key}>
            <label htmlFor={`notes-${key}`} className="block font-medium text-slate-800">
              {label}
            </label>
            {hint && (
              <p id={`notes-${key}-hint`} className="text-sm text-slate-600">
                {hint}
              </p>
            )}
            <textarea
              id={`notes-${key}`}
              rows={key === 'findings' ? 4 : 2}
              value={notes[key]}
              onChange={(e) => setNotes({ ...notes, [key]: e.target.value })}
              aria-describedby={hint ? `notes-${key}-hint` : undefined}
              className="mt-1.5 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-lg"
            />
          </div>
        ))}
        <div className="flex items-center gap-4">
          <button
            type="submit"
            disabled={!dirty || save.isPending}
            className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-50"
          >
            {save.isPending ? 'Saving…' : 'Save notes'}
          </button>
          <p aria-live="polite" className="text-slate-600">
            {save.isSuccess && !dirty ? 'Saved.' : dirty ? 'Unsaved changes.' : ''}
          </p>
        </div>
        <ErrorNote error={save.error} />
      </form>
    </Panel>
  );
}
