'use client';

import { useEffect, useId, useRef, useState, type ReactNode } from 'react';

/**
 * A value with a plain-language explanation that shows on hover and on keyboard focus (and on a
 * tap), stays while the pointer is over it, and closes with Escape (WCAG 1.4.13). The text is
 * also the button's accessible description. Fixed positioning keeps it clear of scrolling tables.
 */
export function Explain(props: { children: ReactNode; text: string; className?: string }) {
  const id = useId();
  const button = useRef<HTMLButtonElement>(null);
  const [at, setAt] = useState<{ top: number; left: number } | null>(null);

  const place = () => {
    const r = button.current?.getBoundingClientRect();
    if (!r) return null;
    const half = Math.min(160, window.innerWidth / 2 - 8);
    const left = Math.min(Math.max(r.left + r.width / 2, half + 8), window.innerWidth - half - 8);
    return { top: r.bottom, left };
  };
  const show = () => setAt(place());
  const hide = () => setAt(null);
  const open = at !== null;

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') setAt(null);
    };
    // Focus moving through a table scrolls it: the explanation follows its figure.
    const follow = () => setAt(place());
    window.addEventListener('keydown', onKey);
    window.addEventListener('scroll', follow, true);
    window.addEventListener('resize', follow);
    return () => {
      window.removeEventListener('keydown', onKey);
      window.removeEventListener('scroll', follow, true);
      window.removeEventListener('resize', follow);
    };
  }, [open]);

  return (
    <span className="inline-block" onMouseEnter={show} onMouseLeave={hide}>
      <button
        ref={button}
        type="button"
        aria-describedby={id}
        onFocus={show}
        onBlur={hide}
        onClick={() => (open ? hide() : show())}
        className={`cursor-help rounded-sm text-inherit underline decoration-slate-400 decoration-dotted underline-offset-4 ${props.className ?? ''}`}
      >
        {props.children}
      </button>
      <span
        role="tooltip"
        id={id}
        hidden={!open}
        style={at ? { top: at.top, left: at.left } : undefined}
        className="fixed z-50 w-80 max-w-[calc(100vw-1rem)] -translate-x-1/2 pt-1.5 text-left"
      >
        <span className="block rounded-md bg-slate-900 px-3 py-2 text-sm leading-snug font-normal whitespace-normal text-white shadow-lg">
          {props.text}
        </span>
      </span>
    </span>
  );
}
