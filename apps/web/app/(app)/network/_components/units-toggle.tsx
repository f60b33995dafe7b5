'use client';

import { usePathname, useRouter, useSearchParams } from 'next/navigation';
import type { TurnaroundUnit } from '~/lib/validators/network';

/** Business hours or business days for turnaround; kept in the address with the period. */
export function UnitsToggle({ unit }: { unit: TurnaroundUnit }) {
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const choose = (next: TurnaroundUnit) => {
    const q = new URLSearchParams(search.toString());
    if (next === 'hours') q.delete('units');
    else q.set('units', next);
    router.replace(`${pathname}?${q.toString()}`, { scroll: false });
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
            checked={unit === u}
            onChange={() => choose(u)}
            className="size-4 accent-sea-700"
          />
          {u === 'hours' ? 'Business hours' : 'Business days'}
        </label>
      ))}
    </fieldset>
  );
}
