import type { ReactNode } from 'react';

/** A numbered step of the import, a section named by its heading. */
export function Step(props: { number: number; title: string; children: ReactNode }) {
  const headingId = `import-step-${props.number}`;
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <h2
        id={headingId}
        className="flex items-center gap-3 border-b border-sand-200 px-5 py-4 text-lg font-semibold text-slate-900"
      >
        <span
          aria-hidden="true"
          className="flex size-7 items-center justify-center rounded-full bg-sea-700 text-sm text-white"
        >
          {props.number}
        </span>
        {props.title}
      </h2>
      <div className="p-5">{props.children}</div>
    </section>
  );
}

export const progressClass =
  'mt-1 h-3 w-full appearance-none overflow-hidden rounded-full bg-sand-200 [&::-moz-progress-bar]:bg-sea-700 [&::-webkit-progress-bar]:bg-sand-200 [&::-webkit-progress-value]:bg-sea-700';

export function Progress(props: { label: string; fraction: number }) {
  const percent = Math.round(Math.max(0, Math.min(1, props.fraction)) * 100);
  return (
    <div className="max-w-xl">
      <div className="flex justify-between text-slate-800">
        <span>{props.label}</span>
        <span className="num">{percent}%</span>
      </div>
      <progress max={100} value={percent} aria-label={props.label} className={progressClass} />
    </div>
  );
}
