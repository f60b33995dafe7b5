'use client';

import { useId, useState } from 'react';
import { Panel } from '~/components/ui';
import { ROLE_LABELS, type Role } from '~/lib/permissions';
import type { ComebackDetail } from '~/server/queries/comebacks';
import { fieldErrors, useComebackMutation } from './use-comeback-mutation';

/** A regional manager or the owner hands the review to another person (who is e-mailed). */
export function ReassignForm({ comeback: c }: { comeback: ComebackDetail }) {
  const id = useId();
  const save = useComebackMutation(c.id);
  const [value, setValue] = useState(c.assignee ? String(c.assignee.id) : '');
  const [done, setDone] = useState<string | null>(null);
  const current = c.assignee ? String(c.assignee.id) : '';
  const error = fieldErrors(save.error).assigneeId ?? (save.isError ? save.error.message : null);
  return (
    <Panel
      title="Who reviews it"
      description={`Without an assignee, ${c.originalJob.shopName}’s lead reviews it. The person you choose is e-mailed the link.`}
    >
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setDone(null);
          save.mutate(
            { assigneeId: value ? Number(value) : null },
            {
              onSuccess: (next) =>
                setDone(
                  next.assignee ? `Assigned to ${next.assignee.name}.` : 'Back with the shop lead.',
                ),
            },
          );
        }}
      >
        <div className="min-w-56 flex-1">
          <label htmlFor={id} className="block font-medium text-slate-800">
            Reviewer
          </label>
          <select
            id={id}
            value={value}
            onChange={(e) => setValue(e.target.value)}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${id}-error` : undefined}
            className="mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3"
          >
            <option value="">The shop lead</option>
            {c.reviewers.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name} ({ROLE_LABELS[p.role as Role].toLowerCase()})
              </option>
            ))}
          </select>
        </div>
        <button
          type="submit"
          disabled={save.isPending || value === current}
          className="inline-flex min-h-11 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50 disabled:opacity-60"
        >
          Reassign
        </button>
      </form>
      <div aria-live="polite" className="mt-2">
        {error && (
          <p id={`${id}-error`} role="alert" className="font-medium text-brick-700">
            {error}
          </p>
        )}
        {done && !save.isError && <p className="font-medium text-sea-800">{done}</p>}
      </div>
    </Panel>
  );
}
