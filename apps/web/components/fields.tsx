import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from 'react';

// Labelled inputs with their error underneath, tied by aria-describedby; shared by the people,
// shop and password forms.

const control =
  'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3 text-slate-900 aria-invalid:border-brick-600';

export function TextField(
  props: { id: string; label: string; error?: string; hint?: string } & Omit<
    InputHTMLAttributes<HTMLInputElement>,
    'id'
  >,
) {
  const { id, label, error, hint, ...input } = props;
  const described = [hint && `${id}-hint`, error && `${id}-error`].filter(Boolean).join(' ');
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        {label}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="text-sm text-slate-600">
          {hint}
        </p>
      )}
      <input
        id={id}
        name={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={described || undefined}
        className={control}
        {...input}
      />
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm text-brick-700">
          {error}
        </p>
      )}
    </div>
  );
}

export function SelectField(
  props: { id: string; label: string; error?: string; children: ReactNode } & Omit<
    SelectHTMLAttributes<HTMLSelectElement>,
    'id'
  >,
) {
  const { id, label, error, children, ...select } = props;
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        {label}
      </label>
      <select
        id={id}
        name={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className={control}
        {...select}
      >
        {children}
      </select>
      {error && (
        <p id={`${id}-error`} className="mt-1 text-sm text-brick-700">
          {error}
        </p>
      )}
    </div>
  );
}

/** A problem that belongs to no single field, announced when it appears. */
export function FormAlert({ children }: { children: ReactNode }) {
  if (!children) return null;
  return (
    <p
      role="alert"
      className="rounded-md border border-brick-200 bg-brick-50 px-4 py-3 text-brick-800"
    >
      {children}
    </p>
  );
}

/** Field errors of a problem document, keyed by the field without its `body.` prefix. */
export function fieldErrors(errors: { field: string; message: string }[] | undefined) {
  const out: Record<string, string> = {};
  for (const e of errors ?? []) out[e.field.replace(/^body\./, '')] ??= e.message;
  return out;
}
