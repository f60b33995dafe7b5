import type { ReactNode } from 'react';

/** A form's submit button with the polite "saved" message beside it, and room for more. */
export function SaveBar(props: {
  label: string;
  pending: boolean;
  /** What to announce once saved; empty otherwise. */
  done: string;
  className?: string;
  children?: ReactNode;
}) {
  return (
    <div className={`flex flex-wrap items-center gap-4 ${props.className ?? ''}`}>
      <button
        type="submit"
        disabled={props.pending}
        className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
      >
        {props.pending ? 'Saving…' : props.label}
      </button>
      <p aria-live="polite" className="font-medium text-sea-800">
        {props.done}
      </p>
      {props.children}
    </div>
  );
}
