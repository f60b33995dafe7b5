'use client';

import { useMutation } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { sendJson } from '~/lib/api-client';
import { useId, useState } from 'react';

interface ItemDraft {
  key: number;
  code: string;
  title: string;
  guidance: string;
  weight: number | string;
  critical: boolean;
}

const field = 'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3';

export function AuditFormEditor({
  initial,
}: {
  initial: { title: string; items: Omit<ItemDraft, 'key'>[] };
}) {
  const router = useRouter();
  const id = useId();
  const [title, setTitle] = useState(initial.title);
  const [items, setItems] = useState<ItemDraft[]>(initial.items.map((i, key) => ({ ...i, key })));
  const [nextKey, setNextKey] = useState(initial.items.length);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const publish = useMutation({
    mutationFn: (body: unknown) => sendJson<{ version: number }>('POST', '/api/audit-forms', body),
    onSuccess: () => router.refresh(),
  });

  const update = (key: number, change: Partial<ItemDraft>) =>
    setItems((list) => list.map((i) => (i.key === key ? { ...i, ...change } : i)));
  const move = (index: number, by: number) =>
    setItems((list) => {
      const next = [...list];
      const [it] = next.splice(index, 1);
      next.splice(index + by, 0, it!);
      return next;
    });
  const total = items.reduce((t, i) => t + (Number(i.weight) || 0), 0);

  const submit = async (event: React.FormEvent) => {
    event.preventDefault();
    const body = {
      title,
      items: items.map(({ key: _key, ...i }) => ({
        ...i,
        guidance: i.guidance || undefined,
        // The API takes numbers; an empty box stays missing so the form says "Enter a weight".
        weight: i.weight === '' ? undefined : Number(i.weight),
      })),
    };
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { auditFormInput } = await import('~/lib/validators/audits');
    const parsed = auditFormInput.safeParse(body);
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
      return;
    }
    setErrors({});
    publish.mutate(parsed.data);
  };

  return (
    <form onSubmit={submit} noValidate>
      <label htmlFor={`${id}-title`} className="font-medium">
        Title
      </label>
      <input
        id={`${id}-title`}
        className={field}
        value={title}
        onChange={(e) => setTitle(e.target.value)}
      />
      {errors.title && <p className="mt-1 text-sm font-semibold text-brick-700">{errors.title}</p>}
      <p className="mt-4 text-sm text-slate-700">
        {items.length} items, weights adding up to {total}; {items.filter((i) => i.critical).length}{' '}
        critical.
      </p>
      {errors.items && <p className="mt-1 text-sm font-semibold text-brick-700">{errors.items}</p>}
      <ol className="mt-3 space-y-4">
        {items.map((item, index) => {
          const err = (f: string) => errors[`items.${index}.${f}`];
          const base = `${id}-${item.key}`;
          return (
            <li key={item.key}>
              <fieldset className="rounded-md border border-sand-300 p-3">
                <legend className="px-1 font-semibold">Item {index + 1}</legend>
                <div className="grid gap-3 md:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_6rem]">
                  <div>
                    <label htmlFor={`${base}-title`} className="text-sm font-medium">
                      What the auditor checks
                    </label>
                    <input
                      id={`${base}-title`}
                      className={field}
                      value={item.title}
                      onChange={(e) => update(item.key, { title: e.target.value })}
                    />
                    {err('title') && (
                      <p className="mt-1 text-sm font-semibold text-brick-700">{err('title')}</p>
                    )}
                  </div>
                  <div>
                    <label htmlFor={`${base}-code`} className="text-sm font-medium">
                      Code
                    </label>
                    <input
                      id={`${base}-code`}
                      className={field}
                      value={item.code}
                      onChange={(e) => update(item.key, { code: e.target.value })}
                    />
                    {err('code') && (
                      <p className="mt-1 text-sm font-semibold text-brick-700">{err('code')}</p>
                    )}
                  </div>
                  <div>
                    <label htmlFor={`${base}-weight`} className="text-sm font-medium">
                      Weight
                    </label>
                    <input
                      id={`${base}-weight`}
                      type="number"
                      min={1}
                      max={100}
                      className={`${field} num`}
                      value={item.weight}
                      onChange={(e) => update(item.key, { weight: e.target.value })}
                    />
                    {err('weight') && (
                      <p className="mt-1 text-sm font-semibold text-brick-700">{err('weight')}</p>
                    )}
                  </div>
                </div>
                <label htmlFor={`${base}-guidance`} className="mt-3 block text-sm font-medium">
                  Guidance
                </label>
                <input
                  id={`${base}-guidance`}
                  className={field}
                  value={item.guidance}
                  onChange={(e) => update(item.key, { guidance: e.target.value })}
                />
                <div className="mt-3 flex flex-wrap items-center gap-3">
                  <label className="inline-flex min-h-11 items-center gap-2">
                    <input
                      type="checkbox"
                      className="size-5 accent-brick-700"
                      checked={item.critical}
                      onChange={(e) => update(item.key, { critical: e.target.checked })}
                    />
                    Critical
                  </label>
                  <span className="flex-1" />
                  <button
                    type="button"
                    className="min-h-11 rounded-md border border-slate-400 px-3 disabled:opacity-50"
                    disabled={index === 0}
                    onClick={() => move(index, -1)}
                  >
                    Move up<span className="sr-only"> item {index + 1}</span>
                  </button>
                  <button
                    type="button"
                    className="min-h-11 rounded-md border border-slate-400 px-3 disabled:opacity-50"
                    disabled={index === items.length - 1}
                    onClick={() => move(index, 1)}
                  >
                    Move down<span className="sr-only"> item {index + 1}</span>
                  </button>
                  <button
                    type="button"
                    className="min-h-11 rounded-md border border-brick-600 px-3 text-brick-700"
                    onClick={() => setItems((l) => l.filter((i) => i.key !== item.key))}
                  >
                    Remove<span className="sr-only"> item {index + 1}</span>
                  </button>
                </div>
              </fieldset>
            </li>
          );
        })}
      </ol>
      <div className="mt-4 flex flex-wrap gap-3">
        <button
          type="button"
          className="min-h-11 rounded-md border border-sea-700 px-4 font-semibold text-sea-800 hover:bg-sea-50"
          onClick={() => {
            setItems((l) => [
              ...l,
              { key: nextKey, code: '', title: '', guidance: '', weight: 10, critical: false },
            ]);
            setNextKey((k) => k + 1);
          }}
        >
          Add an item
        </button>
        <button
          type="submit"
          disabled={publish.isPending}
          className="min-h-11 rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
        >
          {publish.isPending ? 'Publishing…' : 'Publish this version'}
        </button>
      </div>
      <div aria-live="polite" className="mt-3">
        {publish.isSuccess && (
          <p className="font-medium text-sea-800">
            Version {publish.data.version} is published; new rounds will use it.
          </p>
        )}
        {publish.isError && (
          <p role="alert" className="font-medium text-brick-700">
            Not published: {publish.error.message}
          </p>
        )}
        {Object.keys(errors).length > 0 && (
          <p role="alert" className="font-medium text-brick-700">
            Some fields need attention; nothing was published.
          </p>
        )}
      </div>
    </form>
  );
}
