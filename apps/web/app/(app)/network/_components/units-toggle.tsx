'use client';

import { useSearchParams } from 'next/navigation';
import { useState } from 'react';
import type { TurnaroundUnit } from '~/lib/network';

/** The turnaround unit in the address (`units=days`), business hours by default. */
export function useUnit(): TurnaroundUnit {
  return useSearchParams().get('units') === 'days' ? 'days' : 'hours';
}

/**
 * Business hours or business days for turnaround. Only the display changes, so the address is
 * updated in place (shareable) without asking the server again.
 */
export function UnitsToggle() {
  const unit = useUnit();
  const search = useSearchParams();
  // The choice shows at once; the address (and the figures reading it) follow a moment later.
  const [chosen, setChosen] = useState<TurnaroundUnit | null>(null);
  const shown = chosen ?? unit;
  const choose = (next: TurnaroundUnit) => {
    setChosen(next);
    const q = new URLSearchParams(search.toString());
    if (next === 'hours') q.delete('units');
    else q.set('units', next);
    window.history.replaceState(null, '', `?${q.toString()}`);
  };
  return (
    <fieldset className="flex flex-wrap items-center gap-x-3 gap-y-1">
      <legend className="float-left mr-2 text-sm font-medium text-slate-700">Turnaround in</legend>
      {(['hours', 'days'] as const).map((u) => (
        <label
          key={u}
          className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-md px-2 text-slate-800"
        >
          <input
            type="radio"
            name="units"
            value={u}
            checked={shown === u}
            onChange={() => choose(u)}
            className="size-4 accent-sea-700"
          />
          {u === 'hours' ? 'Business hours' : 'Business days'}
        </label>
      ))}
    </fieldset>
  );
}
