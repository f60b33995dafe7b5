'use client';

import { scoreAudit, type AuditAnswer } from '@reelwright/metrics';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { ProblemError, sendJson } from '~/lib/api-client';
import { auditKeys, sampleQuery } from '~/lib/queries/audits';
import { ANSWER_RESULTS, type AnswerResultValue, type VerdictValue } from '~/lib/audits';
import type { SavedSample } from '~/server/audits/score';
import { VerdictBadge } from './badges';
import { formatScore } from './format';
import { ANSWER_LABELS } from './labels';

type Draft = Record<number, { result?: AnswerResultValue; note: string }>;

const VERDICTS: Record<string, VerdictValue> = {
  'meets standard': 'meets_standard',
  'needs work': 'needs_work',
  'critical miss': 'critical_miss',
};

/** The audit form for one sampled job: pass, fail or not applicable per item, with notes. */
export function ScoreForm({ roundId, jobId }: { roundId: number; jobId: number }) {
  const { data } = useQuery(sampleQuery(roundId, jobId));
  const router = useRouter();
  const queryClient = useQueryClient();
  const [draft, setDraft] = useState<Draft>(() =>
    Object.fromEntries(
      (data?.answers ?? []).map((a) => [a.itemId, { result: a.result, note: a.note ?? '' }]),
    ),
  );
  const [note, setNote] = useState(data?.sample.note ?? '');
  const [errors, setErrors] = useState<Record<number, string>>({});
  const [message, setMessage] = useState<string | null>(null);

  const save = useMutation({
    mutationFn: (final: boolean) =>
      sendJson<SavedSample>('PUT', `/api/audit-rounds/${roundId}/samples/${jobId}`, {
        answers: Object.entries(draft)
          .filter(([, a]) => a.result)
          .map(([itemId, a]) => ({
            itemId: Number(itemId),
            result: a.result,
            note: a.note.trim() || undefined,
          })),
        note: note.trim() || undefined,
        final,
      }),
    onSuccess: async (saved) => {
      await queryClient.invalidateQueries({ queryKey: auditKeys.all });
      if (!saved.final) {
        setMessage(
          `Saved part-way: ${saved.answered} of ${saved.items} items answered. You can finish later.`,
        );
        return;
      }
      if (saved.round.status === 'decided') {
        router.push(`/audits/${roundId}`);
      } else if (saved.nextUnscoredJobId !== null) {
        router.push(`/audits/${roundId}/samples/${saved.nextUnscoredJobId}`);
      } else {
        setMessage('Scored.');
      }
      router.refresh();
    },
  });

  if (!data) return null;
  const items = data.items;
  const answers: Record<string, AuditAnswer> = {};
  for (const [itemId, a] of Object.entries(draft))
    if (a.result) answers[itemId] = a.result === 'not_applicable' ? 'n/a' : a.result;
  const live = scoreAudit(
    items.map((i) => ({ id: String(i.id), weight: i.weight, critical: i.critical })),
    answers,
    data.passMark,
  );
  const answeredCount = items.filter((i) => draft[i.id]?.result).length;

  const set = (itemId: number, change: Partial<Draft[number]>) => {
    setDraft((d) => ({ ...d, [itemId]: { note: '', ...d[itemId], ...change } }));
    setErrors((e) => {
      const { [itemId]: _gone, ...rest } = e;
      return rest;
    });
    setMessage(null);
  };

  const finish = () => {
    const problems: Record<number, string> = {};
    for (const item of items) {
      const a = draft[item.id];
      if (!a?.result) problems[item.id] = 'Choose pass, fail or not applicable';
      else if (a.result === 'fail' && !a.note.trim()) problems[item.id] = 'Say what was wrong';
    }
    setErrors(problems);
    if (Object.keys(problems).length) {
      setMessage(
        `${Object.keys(problems).length} items need attention before this job can be finished.`,
      );
      const first = items.find((i) => problems[i.id]);
      if (first) document.getElementById(`item-${first.id}`)?.focus();
      return;
    }
    save.mutate(true);
  };

  const serverError =
    save.error instanceof ProblemError
      ? (save.error.problem.detail ?? save.error.message)
      : save.error?.message;

  if (!data.canScore) {
    return (
      <div>
        <p className="text-slate-700">
          {data.sample.completedAt
            ? 'Scored'
            : data.answers.length
              ? 'Saved part-way'
              : 'Not scored yet'}
          {data.round.status === 'decided'
            ? '; the round is decided and its scores are closed.'
            : '.'}
        </p>
        {data.sample.verdict && data.sample.score !== null && (
          <p className="mt-2 flex items-center gap-2">
            <span className="text-2xl font-semibold tabular-nums">
              {formatScore(data.sample.score)}
            </span>
            <VerdictBadge verdict={data.sample.verdict} />
          </p>
        )}
        <ol className="mt-4 space-y-3">
          {items.map((item) => {
            const a = data.answers.find((x) => x.itemId === item.id);
            return (
              <li key={item.id} className="border-b border-sand-100 pb-2">
                <p className="font-medium">
                  {item.title}
                  {item.critical && (
                    <span className="ml-2 text-sm font-semibold text-brick-700">Critical</span>
                  )}
                </p>
                <p
                  className={
                    a?.result === 'fail' ? 'font-semibold text-brick-700' : 'text-slate-700'
                  }
                >
                  {a ? ANSWER_LABELS[a.result] : 'Not answered'}
                  {a?.note ? ` — ${a.note}` : ''}
                </p>
              </li>
            );
          })}
        </ol>
        {data.sample.note && <p className="mt-3 text-slate-700">Note: {data.sample.note}</p>}
      </div>
    );
  }

  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        finish();
      }}
      noValidate
    >
      <div className="mb-4 rounded-md border border-sand-200 bg-sand-50 p-3" aria-live="polite">
        <p className="text-sm text-slate-600">
          {answeredCount} of {items.length} answered · pass mark {data.passMark}
        </p>
        {answeredCount === 0 ? (
          <p className="mt-1 text-slate-700">The score appears as you answer.</p>
        ) : (
          <p className="mt-1 flex flex-wrap items-center gap-2">
            <span className="text-3xl font-semibold tabular-nums">
              {formatScore(Math.round(live.score * 10) / 10)}
            </span>
            <VerdictBadge verdict={VERDICTS[live.verdict]!} />
            {answeredCount < items.length && <span className="text-sm text-slate-600">so far</span>}
          </p>
        )}
      </div>
      <ol className="space-y-5">
        {items.map((item, index) => {
          const a = draft[item.id];
          const error = errors[item.id];
          return (
            <li key={item.id}>
              <fieldset
                id={`item-${item.id}`}
                tabIndex={-1}
                aria-describedby={error ? `item-${item.id}-error` : undefined}
                className={`rounded-md border p-3 ${error ? 'border-brick-500' : 'border-sand-300'}`}
              >
                <legend className="px-1 font-semibold">
                  {index + 1}. {item.title}
                </legend>
                <p className="text-sm text-slate-600">
                  Weight {item.weight}
                  {item.critical && (
                    <span className="ml-2 font-semibold text-brick-700">
                      Critical: a fail is a critical miss
                    </span>
                  )}
                </p>
                {item.guidance && <p className="mt-1 text-sm text-slate-700">{item.guidance}</p>}
                <div className="mt-2 flex flex-wrap gap-1.5">
                  {ANSWER_RESULTS.map((result) => (
                    <label
                      key={result}
                      className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-md border border-slate-400 px-2.5 has-checked:border-sea-700 has-checked:bg-sea-50 has-checked:font-semibold"
                    >
                      <input
                        type="radio"
                        name={`item-${item.id}-result`}
                        value={result}
                        checked={a?.result === result}
                        onChange={() => set(item.id, { result })}
                        className="size-5 accent-sea-700"
                      />
                      {ANSWER_LABELS[result]}
                    </label>
                  ))}
                </div>
                <label htmlFor={`item-${item.id}-note`} className="mt-2 block text-sm font-medium">
                  Note{a?.result === 'fail' ? ' (what was wrong)' : ''}
                </label>
                <input
                  id={`item-${item.id}-note`}
                  type="text"
                  value={a?.note ?? ''}
                  onChange={(e) => set(item.id, { note: e.target.value })}
                  className="mt-1 block min-h-11 w-full rounded-md border border-slate-400 px-3"
                />
                {error && (
                  <p
                    id={`item-${item.id}-error`}
                    className="mt-1 text-sm font-semibold text-brick-700"
                  >
                    {error}
                  </p>
                )}
              </fieldset>
            </li>
          );
        })}
      </ol>
      <label htmlFor="sample-note" className="mt-5 block font-medium">
        Note on this job (optional)
      </label>
      <textarea
        id="sample-note"
        rows={3}
        value={note}
        onChange={(e) => setNote(e.target.value)}
        className="mt-1 block w-full rounded-md border border-slate-400 px-3 py-2"
      />
      <div className="mt-5 flex flex-wrap gap-3">
        <button
          type="submit"
          disabled={save.isPending}
          className="inline-flex min-h-11 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
        >
          Finish this job
        </button>
        <button
          type="button"
          disabled={save.isPending}
          onClick={() => save.mutate(false)}
          className="inline-flex min-h-11 items-center rounded-md border border-sea-700 px-5 font-semibold text-sea-800 hover:bg-sea-50 disabled:opacity-60"
        >
          Save and finish later
        </button>
      </div>
      <div aria-live="polite" className="mt-3">
        {message && <p className="font-medium text-slate-800">{message}</p>}
        {save.isError && (
          <p role="alert" className="font-medium text-brick-700">
            Not saved: {serverError}
          </p>
        )}
      </div>
    </form>
  );
}
