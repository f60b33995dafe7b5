'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { SaveBar } from '~/components/save-bar';
import { Panel } from '~/components/ui';
import { ProblemError, sendJson } from '~/lib/api-client';
import {
  comebackKeys,
  comebackSettingsQuery,
  type ComebackSettingsView,
} from '~/lib/queries/comebacks';
import { ATTRIBUTION_LABELS, ATTRIBUTIONS, type AttributionValue } from '~/lib/comebacks';
import type { ComebackSettingsInput } from '~/lib/validators/comebacks';

interface CauseDraft {
  /** Absent until saved. */
  id?: number;
  /** A key for React that survives reordering. */
  key: string;
  label: string;
  active: boolean;
  used: number;
}

const input =
  'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3 aria-invalid:border-brick-600';
const smallButton =
  'inline-flex min-h-11 min-w-11 items-center justify-center rounded-md border border-slate-400 bg-white px-3 font-medium text-slate-800 hover:bg-sand-100 disabled:opacity-40';

export function ComebackSettingsForm() {
  const { data } = useQuery(comebackSettingsQuery());
  if (!data) return <p className="text-slate-600">Loading the settings…</p>;
  return <Editor initial={data} />;
}

function Editor({ initial }: { initial: ComebackSettingsView }) {
  const uid = useId();
  const f = (name: string) => `${uid}-${name}`;
  const queryClient = useQueryClient();
  const [warrantyDays, setWarrantyDays] = useState(String(initial.settings.warrantyDays));
  const [deadline, setDeadline] = useState(String(initial.settings.reviewDeadlineDays));
  const [dueDays, setDueDays] = useState(String(initial.settings.correctiveActionDueDays));
  const [counted, setCounted] = useState<AttributionValue[]>(initial.settings.countedAttributions);
  const [causes, setCauses] = useState<CauseDraft[]>(
    initial.rootCauses.map((c) => ({ ...c, key: `c${c.id}` })),
  );
  const [newLabel, setNewLabel] = useState('');
  const [local, setLocal] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const save = useMutation({
    mutationFn: (body: ComebackSettingsInput) =>
      sendJson<ComebackSettingsView>('PUT', '/api/settings/comebacks', body),
    onSuccess: (next) => {
      queryClient.setQueryData(comebackKeys.settings, next);
      void queryClient.invalidateQueries({ queryKey: comebackKeys.all });
    },
  });

  const server: Record<string, string> = {};
  if (save.error instanceof ProblemError)
    for (const e of save.error.problem.errors ?? [])
      server[e.field.replace(/^body\./, '')] ??= e.message;
  const errors = { ...server, ...local };
  const err = (k: string) => errors[k];
  /** A field's message goes as soon as the field is changed. */
  const fix = (key: string) => {
    setSaved(false);
    if (local[key])
      setLocal((l) => Object.fromEntries(Object.entries(l).filter(([k]) => k !== key)));
    if (server[key]) save.reset();
  };
  const nameOf = (key: string) => {
    const cause = /^rootCauses\.(\d+)/.exec(key);
    if (cause) return `Root cause ${Number(cause[1]) + 1}`;
    return (
      {
        warrantyDays: 'Warranty window',
        reviewDeadlineDays: 'Review deadline',
        correctiveActionDueDays: 'Corrective action due',
        countedAttributions: 'Attributions that count',
        rootCauses: 'Root causes',
      } as Record<string, string>
    )[key];
  };

  const move = (i: number, by: number) =>
    setCauses((list) => {
      const next = [...list];
      const [item] = next.splice(i, 1);
      next.splice(i + by, 0, item!);
      return next;
    });
  const edit = (i: number, patch: Partial<CauseDraft>) =>
    setCauses((list) => list.map((c, k) => (k === i ? { ...c, ...patch } : c)));

  const submit = async () => {
    setSaved(false);
    const body = {
      warrantyDays: Number(warrantyDays),
      reviewDeadlineDays: Number(deadline),
      correctiveActionDueDays: Number(dueDays),
      countedAttributions: ATTRIBUTIONS.filter((a) => counted.includes(a)),
      rootCauses: causes.map((c) => ({ id: c.id, label: c.label, active: c.active })),
    };
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { comebackSettingsInput } = await import('~/lib/validators/comebacks');
    const parsed = comebackSettingsInput.safeParse({
      ...body,
      warrantyDays: warrantyDays.trim() === '' ? undefined : body.warrantyDays,
      reviewDeadlineDays: deadline.trim() === '' ? undefined : body.reviewDeadlineDays,
      correctiveActionDueDays: dueDays.trim() === '' ? undefined : body.correctiveActionDueDays,
    });
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) next[issue.path.join('.')] ??= issue.message;
      setLocal(next);
      return;
    }
    setLocal({});
    save.mutate(parsed.data, {
      onSuccess: (next) => {
        // New causes now have ids: a second save must rename them, not add them again.
        setCauses(next.rootCauses.map((c) => ({ ...c, key: `c${c.id}` })));
        setSaved(true);
      },
    });
  };

  const numberField = (
    key: 'warrantyDays' | 'reviewDeadlineDays' | 'correctiveActionDueDays',
    label: string,
    hint: string,
    value: string,
    set: (v: string) => void,
  ) => (
    <div>
      <label htmlFor={f(key)} className="block font-medium text-slate-800">
        {label}
      </label>
      <p id={f(`${key}-hint`)} className="text-sm text-slate-600">
        {hint}
      </p>
      <input
        id={f(key)}
        type="number"
        inputMode="numeric"
        min={1}
        value={value}
        onChange={(e) => {
          set(e.target.value);
          fix(key);
        }}
        aria-invalid={err(key) ? true : undefined}
        aria-describedby={[f(`${key}-hint`), err(key) ? f(`${key}-error`) : '']
          .filter(Boolean)
          .join(' ')}
        className={`${input} num max-w-40`}
      />
      {err(key) && (
        <p id={f(`${key}-error`)} className="mt-1 font-medium text-brick-700">
          {err(key)}
        </p>
      )}
    </div>
  );

  const summary = Object.entries(errors);
  return (
    <form
      noValidate
      className="space-y-8"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      {summary.length > 0 && (
        <div role="alert" className="rounded-md border border-brick-300 bg-brick-50 p-4">
          <p className="font-semibold text-brick-800">Nothing was saved:</p>
          <ul className="mt-1 list-disc pl-5 text-brick-800">
            {summary.map(([k, m]) => (
              <li key={k}>
                {nameOf(k) ? `${nameOf(k)}: ` : ''}
                {m}
              </li>
            ))}
          </ul>
        </div>
      )}
      <Panel
        title="Warranty window and review"
        description="A reel checked in again before its window has closed is flagged as a possible comeback of its last job, at whichever shop it returns to. The network's and shops' comeback rates are worked out with the window as it is set now."
      >
        <div className="grid gap-6 md:grid-cols-3">
          {numberField(
            'warrantyDays',
            'Warranty window (days)',
            'After collection; 30 to 90 days is usual in the trade.',
            warrantyDays,
            setWarrantyDays,
          )}
          {numberField(
            'reviewDeadlineDays',
            'Review deadline (days)',
            'Open reviews older than this are highlighted.',
            deadline,
            setDeadline,
          )}
          {numberField(
            'correctiveActionDueDays',
            'Corrective action due (days)',
            'The due date offered when a review opens one.',
            dueDays,
            setDueDays,
          )}
        </div>
      </Panel>

      <Panel
        title="Attributions that count"
        description="Confirmed comebacks with these attributions count against the shop in the comeback rate."
      >
        <fieldset aria-describedby={err('countedAttributions') ? f('counted-error') : undefined}>
          <legend className="sr-only">Attributions that count in the comeback rate</legend>
          <div className="grid gap-2 sm:grid-cols-2 lg:grid-cols-5">
            {ATTRIBUTIONS.map((a) => (
              <label
                key={a}
                className="flex min-h-12 items-center gap-3 rounded-md border border-sand-300 px-4 has-checked:border-sea-700 has-checked:bg-sea-50"
              >
                <input
                  type="checkbox"
                  checked={counted.includes(a)}
                  onChange={(e) => {
                    setCounted((list) =>
                      e.target.checked ? [...list, a] : list.filter((x) => x !== a),
                    );
                    fix('countedAttributions');
                  }}
                  className="size-5 accent-sea-700"
                />
                {ATTRIBUTION_LABELS[a]}
              </label>
            ))}
          </div>
          {err('countedAttributions') && (
            <p id={f('counted-error')} className="mt-1 font-medium text-brick-700">
              {err('countedAttributions')}
            </p>
          )}
        </fieldset>
      </Panel>

      <Panel
        title="Root causes"
        description="The short list reviewers choose from, in this order. Rename or deactivate a cause rather than remove it: earlier reviews keep naming it."
      >
        {err('rootCauses') && (
          <p className="mb-3 font-medium text-brick-700">{err('rootCauses')}</p>
        )}
        <ol className="space-y-3">
          {causes.map((c, i) => {
            const key = `rootCauses.${i}.label`;
            return (
              <li
                key={c.key}
                className={`flex flex-wrap items-end gap-3 rounded-md border p-3 ${c.active ? 'border-sand-200' : 'border-dashed border-slate-300 bg-sand-50'}`}
              >
                <div className="min-w-56 flex-1">
                  <label htmlFor={f(`cause-${c.key}`)} className="block text-sm font-medium">
                    Root cause {i + 1}
                    {c.used > 0
                      ? ` · named in ${c.used} ${c.used === 1 ? 'review' : 'reviews'}`
                      : ''}
                    {c.id === undefined ? ' · new' : ''}
                  </label>
                  <input
                    id={f(`cause-${c.key}`)}
                    value={c.label}
                    onChange={(e) => {
                      edit(i, { label: e.target.value });
                      fix(key);
                    }}
                    aria-invalid={err(key) ? true : undefined}
                    aria-describedby={err(key) ? f(`cause-${c.key}-error`) : undefined}
                    className={input}
                  />
                  {err(key) && (
                    <p id={f(`cause-${c.key}-error`)} className="mt-1 font-medium text-brick-700">
                      {err(key)}
                    </p>
                  )}
                </div>
                <label className="flex min-h-11 items-center gap-2">
                  <input
                    type="checkbox"
                    checked={c.active}
                    onChange={(e) => {
                      edit(i, { active: e.target.checked });
                      fix('rootCauses');
                    }}
                    className="size-5 accent-sea-700"
                  />
                  Offered to reviewers
                </label>
                <div className="flex gap-2">
                  <button
                    type="button"
                    onClick={() => move(i, -1)}
                    disabled={i === 0}
                    aria-label={`Move ${c.label || `root cause ${i + 1}`} up`}
                    className={smallButton}
                  >
                    ↑
                  </button>
                  <button
                    type="button"
                    onClick={() => move(i, 1)}
                    disabled={i === causes.length - 1}
                    aria-label={`Move ${c.label || `root cause ${i + 1}`} down`}
                    className={smallButton}
                  >
                    ↓
                  </button>
                  {c.id === undefined && (
                    <button
                      type="button"
                      onClick={() => setCauses((list) => list.filter((_, k) => k !== i))}
                      className={smallButton}
                    >
                      Remove
                    </button>
                  )}
                </div>
              </li>
            );
          })}
        </ol>
        <div className="mt-4 flex flex-wrap items-end gap-3">
          <div className="min-w-56 flex-1">
            <label htmlFor={f('new-cause')} className="block font-medium text-slate-800">
              New root cause
            </label>
            <input
              id={f('new-cause')}
              value={newLabel}
              onChange={(e) => setNewLabel(e.target.value)}
              onKeyDown={(e) => {
                if (e.key === 'Enter') {
                  e.preventDefault();
                  if (newLabel.trim()) {
                    setCauses((list) => [
                      ...list,
                      { key: `n${Date.now()}`, label: newLabel.trim(), active: true, used: 0 },
                    ]);
                    setNewLabel('');
                  }
                }
              }}
              className={input}
            />
          </div>
          <button
            type="button"
            disabled={!newLabel.trim()}
            onClick={() => {
              setCauses((list) => [
                ...list,
                { key: `n${Date.now()}`, label: newLabel.trim(), active: true, used: 0 },
              ]);
              setNewLabel('');
            }}
            className="inline-flex min-h-11 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50 disabled:opacity-60"
          >
            Add to the list
          </button>
        </div>
      </Panel>

      <SaveBar
        label="Save the comeback settings"
        pending={save.isPending}
        done={saved && !save.isPending && !save.isError ? 'Saved.' : ''}
      >
        {save.isError && Object.keys(server).length === 0 && (
          <p role="alert" className="font-medium text-brick-700">
            Not saved: {save.error.message}
          </p>
        )}
      </SaveBar>
    </form>
  );
}
