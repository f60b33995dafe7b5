'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useId, useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { Empty, Stat } from '~/components/ui';
import { auditKeys, correctiveActionsQuery } from '~/lib/queries/audits';
import { CORRECTIVE_ACTION_STATUSES, type CorrectiveActionStatusValue } from '~/lib/audits';
import { type CorrectiveActionPatch } from '~/lib/validators/audits';
import type { CorrectiveActionRow } from '~/server/queries/corrective-actions';
import { CorrectiveActionStatusBadge, OverdueBadge } from '../../audits/_components/badges';
import { formatInstant, formatLocalDate } from '../../audits/_components/format';
import { CORRECTIVE_ACTION_STATUS_LABELS } from '../../audits/_components/labels';

const MOVE_LABELS: Record<CorrectiveActionStatusValue, string> = {
  open: 'Reopen',
  in_progress: 'Start work',
  done: 'Mark done',
  verified: 'Verify',
};

export function CorrectiveActionsList() {
  const { data, isPending, isError, error } = useQuery(correctiveActionsQuery());
  const [filter, setFilter] = useState<'all' | 'unverified' | CorrectiveActionStatusValue>(
    'unverified',
  );
  const filterId = useId();
  if (isPending) return <p className="text-slate-600">Loading corrective actions…</p>;
  if (isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load corrective actions: {error.message}
      </p>
    );
  const all = data.correctiveActions;
  const shown = all.filter((a) =>
    filter === 'all'
      ? true
      : filter === 'unverified'
        ? a.status !== 'verified'
        : a.status === filter,
  );
  const count = (s: CorrectiveActionStatusValue) => all.filter((a) => a.status === s).length;
  return (
    <>
      <dl className="mb-6 grid grid-cols-2 gap-4 md:grid-cols-4">
        <Stat label="Open" value={count('open')} />
        <Stat label="In progress" value={count('in_progress')} />
        <Stat label="Done, to verify" value={count('done')} />
        <Stat
          label="Overdue"
          value={all.filter((a) => a.overdue).length}
          hint="Past the due date, not done"
        />
      </dl>
      <div className="mb-4 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={filterId} className="block font-medium">
            Show
          </label>
          <select
            id={filterId}
            value={filter}
            onChange={(e) => setFilter(e.target.value as typeof filter)}
            className="mt-1 min-h-11 rounded-md border border-slate-400 bg-white px-3"
          >
            <option value="unverified">Not yet verified</option>
            <option value="all">All</option>
            {CORRECTIVE_ACTION_STATUSES.map((s) => (
              <option key={s} value={s}>
                {CORRECTIVE_ACTION_STATUS_LABELS[s]}
              </option>
            ))}
          </select>
        </div>
        <p className="pb-2 text-slate-600" aria-live="polite">
          Showing {shown.length} of {all.length}
        </p>
      </div>
      {shown.length === 0 ? (
        <div className="rounded-lg border border-sand-200 bg-white">
          <Empty>No corrective actions to show.</Empty>
        </div>
      ) : (
        <ul className="space-y-4">
          {shown.map((a) => (
            <li key={a.id}>
              <ActionCard action={a} />
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

function ActionCard({ action }: { action: CorrectiveActionRow }) {
  const queryClient = useQueryClient();
  const id = useId();
  const [note, setNote] = useState(action.resolutionNote ?? '');
  const [dueOn, setDueOn] = useState(action.dueOn);
  const patch = useMutation({
    mutationFn: (body: CorrectiveActionPatch) =>
      sendJson<CorrectiveActionRow>('PATCH', `/api/corrective-actions/${action.id}`, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: auditKeys.allCorrectiveActions }),
  });
  const lead = action.moves.includes('done');
  return (
    <article
      id={`action-${action.id}`}
      aria-labelledby={`${id}-title`}
      className={`rounded-lg border bg-white p-5 shadow-sm ${action.overdue ? 'border-brick-400 border-l-8' : 'border-sand-200'}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id={`${id}-title`} className="text-lg font-semibold">
            #{action.id} {action.title}
          </h2>
          <p className="text-slate-700">
            {action.shop.name}
            {action.auditRoundId && (
              <>
                {' · '}
                <Link
                  href={`/audits/${action.auditRoundId}/report`}
                  className="text-sea-700 underline underline-offset-2"
                >
                  Report of round #{action.auditRoundId}
                </Link>
              </>
            )}
            {action.comebackId && (
              <>
                {' · '}
                <Link
                  href={`/comebacks/${action.comebackId}`}
                  className="text-sea-700 underline underline-offset-2"
                >
                  Review of comeback #{action.comebackId}
                </Link>
              </>
            )}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          {action.overdue && <OverdueBadge />}
          <CorrectiveActionStatusBadge status={action.status} />
        </div>
      </div>
      <dl className="mt-3 grid grid-cols-2 gap-x-6 gap-y-1 sm:grid-cols-4">
        <div>
          <dt className="text-sm text-slate-600">Owner</dt>
          <dd className="font-medium">{action.owner?.name ?? 'Not set'}</dd>
        </div>
        <div>
          <dt className="text-sm text-slate-600">Due</dt>
          <dd className={`font-medium ${action.overdue ? 'text-brick-700' : ''}`}>
            {formatLocalDate(action.dueOn)}
          </dd>
        </div>
        <div>
          <dt className="text-sm text-slate-600">Opened</dt>
          <dd>{formatInstant(action.createdAt, action.shop.timeZone, 'd MMM yyyy')}</dd>
        </div>
        <div>
          <dt className="text-sm text-slate-600">{action.verifiedAt ? 'Verified' : 'Done'}</dt>
          <dd>
            {action.verifiedAt
              ? `${formatInstant(action.verifiedAt, action.shop.timeZone, 'd MMM yyyy')} by ${action.verifiedBy ?? '—'}`
              : action.doneAt
                ? formatInstant(action.doneAt, action.shop.timeZone, 'd MMM yyyy')
                : '—'}
          </dd>
        </div>
      </dl>
      {action.description && (
        <p className="mt-3 whitespace-pre-line text-slate-800">{action.description}</p>
      )}
      {action.resolutionNote && !lead && (
        <p className="mt-3 rounded-md bg-sand-50 p-3">
          <span className="font-medium">What was done:</span> {action.resolutionNote}
        </p>
      )}
      {(action.moves.length > 0 || action.canEdit) && (
        <div className="mt-4 border-t border-sand-200 pt-4">
          {lead && (
            <div className="mb-3">
              <label htmlFor={`${id}-note`} className="block font-medium">
                What was done
              </label>
              <textarea
                id={`${id}-note`}
                rows={2}
                value={note}
                onChange={(e) => setNote(e.target.value)}
                className="mt-1 block w-full rounded-md border border-slate-400 px-3 py-2"
              />
            </div>
          )}
          <div className="flex flex-wrap items-end gap-3">
            {action.moves.map((to) => (
              <button
                key={to}
                type="button"
                disabled={patch.isPending}
                onClick={() =>
                  patch.mutate(
                    to === 'done' || (lead && note.trim())
                      ? { status: to, resolutionNote: note.trim() || undefined }
                      : { status: to },
                  )
                }
                className={
                  to === 'in_progress' && action.status === 'done'
                    ? 'inline-flex min-h-11 items-center rounded-md border border-slate-500 px-4 font-semibold text-slate-800 hover:bg-sand-100 disabled:opacity-60'
                    : 'inline-flex min-h-11 items-center rounded-md bg-sea-700 px-4 font-semibold text-white hover:bg-sea-800 disabled:opacity-60'
                }
              >
                {to === 'in_progress' && action.status === 'done' ? 'Send back' : MOVE_LABELS[to]}
              </button>
            ))}
            {action.canEdit && (
              <div className="flex items-end gap-2">
                <div>
                  <label htmlFor={`${id}-due`} className="block text-sm font-medium">
                    Due date
                  </label>
                  <input
                    id={`${id}-due`}
                    type="date"
                    value={dueOn}
                    onChange={(e) => setDueOn(e.target.value)}
                    className="mt-1 min-h-11 rounded-md border border-slate-400 px-3"
                  />
                </div>
                <button
                  type="button"
                  disabled={patch.isPending || dueOn === action.dueOn || !dueOn}
                  onClick={() => patch.mutate({ dueOn })}
                  className="inline-flex min-h-11 items-center rounded-md border border-sea-700 px-4 font-semibold text-sea-800 hover:bg-sea-50 disabled:opacity-60"
                >
                  Change due date
                </button>
              </div>
            )}
          </div>
          <div aria-live="polite" className="mt-2">
            {patch.isError && (
              <p role="alert" className="font-medium text-brick-700">
                Not changed: {patch.error.message}
              </p>
            )}
          </div>
        </div>
      )}
    </article>
  );
}
