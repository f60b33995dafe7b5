import type { ReactNode } from 'react';

/** The id of a field's control; its hint and error take the same id with a suffix. */
export const fieldId = (path: string) => `ci-${path.replace(/\./g, '-')}`;

export const inputClass =
  'mt-1.5 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-lg text-slate-900 aria-invalid:border-brick-600';

const textAreaClass =
  'mt-1.5 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-lg text-slate-900 aria-invalid:border-brick-600';

/** What the control of a field needs to be labelled, described and marked invalid. */
export interface FieldControl {
  id: string;
  invalid: true | undefined;
  describedBy: string | undefined;
}

/** What binds a text field to its state: the form's path, the value, the setter and the message. */
export interface FieldBinding {
  path: string;
  value: string;
  onChange: (value: string) => void;
  error?: string;
}

export function FieldError({ path, error }: { path: string; error?: string }) {
  if (!error) return null;
  return (
    <p id={`${fieldId(path)}-error`} className="mt-1 text-brick-700">
      {error}
    </p>
  );
}

/** A label, the control, then the hint and the error message the control is described by. */
export function Field(props: {
  path: string;
  label: string;
  error?: string;
  hint?: string;
  children: (control: FieldControl) => ReactNode;
}) {
  const id = fieldId(props.path);
  const describedBy =
    [props.hint ? `${id}-hint` : null, props.error ? `${id}-error` : null]
      .filter(Boolean)
      .join(' ') || undefined;
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        {props.label}
      </label>
      {props.children({ id, invalid: props.error ? true : undefined, describedBy })}
      {props.hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-slate-600">
          {props.hint}
        </p>
      )}
      <FieldError path={props.path} error={props.error} />
    </div>
  );
}

export function TextField(
  props: FieldBinding & {
    label: string;
    hint?: string;
    type?: string;
    inputMode?: 'numeric' | 'tel' | 'email';
    autoComplete?: string;
    min?: string;
  },
) {
  return (
    <Field path={props.path} label={props.label} error={props.error} hint={props.hint}>
      {(c) => (
        <input
          id={c.id}
          type={props.type ?? 'text'}
          inputMode={props.inputMode}
          value={props.value}
          min={props.min}
          autoComplete={props.autoComplete}
          onChange={(e) => props.onChange(e.target.value)}
          aria-invalid={c.invalid}
          aria-describedby={c.describedBy}
          className={inputClass}
        />
      )}
    </Field>
  );
}

export function TextArea(props: FieldBinding & { label: string; hint?: string }) {
  return (
    <Field path={props.path} label={props.label} error={props.error} hint={props.hint}>
      {(c) => (
        <textarea
          id={c.id}
          rows={3}
          value={props.value}
          onChange={(e) => props.onChange(e.target.value)}
          aria-invalid={c.invalid}
          aria-describedby={c.describedBy}
          className={textAreaClass}
        />
      )}
    </Field>
  );
}

export function Section(props: { title: string; id: string; children: ReactNode }) {
  return (
    <section
      aria-labelledby={props.id}
      className="rounded-lg border border-sand-200 bg-white p-5 shadow-sm sm:p-6"
    >
      <h2 id={props.id} className="mb-4 text-xl font-semibold text-slate-900">
        {props.title}
      </h2>
      {props.children}
    </section>
  );
}

/** A radio button drawn as a card; the whole card is the label. */
export function Choice(props: {
  name: string;
  checked: boolean;
  onChange: () => void;
  children: ReactNode;
}) {
  return (
    <label className="flex min-h-12 cursor-pointer items-center gap-3 rounded-md border border-sand-300 bg-white px-4 py-2 has-checked:border-sea-700 has-checked:bg-sea-50 has-checked:ring-1 has-checked:ring-sea-700">
      <input
        type="radio"
        name={props.name}
        checked={props.checked}
        onChange={props.onChange}
        className="size-5 shrink-0 accent-sea-700"
      />
      <span>{props.children}</span>
    </label>
  );
}

/**
 * A required choice among cards. The legend carries the field's id and takes focus, so the error
 * summary's link lands on the question.
 */
export function ChoiceFieldset(props: {
  path: string;
  legend: string;
  error?: string;
  /** The grid columns of the cards, e.g. "md:grid-cols-2". */
  columns: string;
  children: ReactNode;
}) {
  const id = fieldId(props.path);
  return (
    <fieldset aria-describedby={props.error ? `${id}-error` : undefined}>
      <legend id={id} tabIndex={-1} className="font-medium text-slate-800">
        {props.legend}
      </legend>
      <div className={`mt-2 grid gap-2 ${props.columns}`}>{props.children}</div>
      <FieldError path={props.path} error={props.error} />
    </fieldset>
  );
}

/** A short choice between a few options, side by side (use, water). */
export function ChoiceRow<T extends string>(props: {
  name: string;
  legend: string;
  options: readonly T[];
  labels: Record<string, string>;
  value: string;
  onChange: (value: T) => void;
}) {
  return (
    <fieldset>
      <legend className="font-medium text-slate-800">{props.legend}</legend>
      <div className="mt-1.5 flex gap-2">
        {props.options.map((option) => (
          <Choice
            key={option}
            name={props.name}
            checked={props.value === option}
            onChange={() => props.onChange(option)}
          >
            <span className="whitespace-nowrap">{props.labels[option]}</span>
          </Choice>
        ))}
      </div>
    </fieldset>
  );
}
