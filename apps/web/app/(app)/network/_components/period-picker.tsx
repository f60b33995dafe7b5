'use client';

import { useRouter } from 'next/navigation';
import { useId, useState, type FormEvent } from 'react';
import type { TurnaroundUnit } from '~/lib/network';
import {
  kindOf,
  monthOptions,
  quarterOptions,
  seasonOptions,
  viewHref,
  type PeriodKind,
} from './periods';

const KIND_LABELS: Record<PeriodKind, string> = {
  month: 'Month',
  quarter: 'Quarter',
  season: 'Season',
  custom: 'Custom dates',
};

const field =
  'min-h-11 rounded-md border border-sand-300 bg-white px-3 text-slate-900 shadow-sm focus-visible:border-sea-600';

/**
 * The period (month, quarter, season or custom dates) and, for the owner, the region. The choice
 * goes into the address, so a view can be shared; nothing changes until "Show" is pressed.
 */
export function PeriodPicker(props: {
  path: string;
  from: string;
  to: string;
  today: string;
  seasons: { start: string; end: string }[];
  units: TurnaroundUnit;
  region?: number;
  regions?: { id: number; name: string }[];
}) {
  const router = useRouter();
  const id = useId();
  const months = monthOptions(props.today);
  const quarters = quarterOptions(props.today);
  const seasons = seasonOptions(props.today, props.seasons);
  const initialKind = kindOf(props.from, props.to, props.seasons);
  const [kind, setKind] = useState<PeriodKind>(initialKind);
  const [month, setMonth] = useState(
    months.find((o) => o.period.from === props.from && o.period.to === props.to)?.value ??
      months[1]!.value,
  );
  const [quarter, setQuarter] = useState(
    quarters.find((o) => o.period.from === props.from && o.period.to === props.to)?.value ??
      quarters[1]!.value,
  );
  const [season, setSeason] = useState(
    seasons.find((o) => o.period.from === props.from && o.period.to === props.to)?.value ??
      seasons[0]!.value,
  );
  const [from, setFrom] = useState(props.from);
  const [to, setTo] = useState(props.to);
  const [region, setRegion] = useState(props.region === undefined ? '' : String(props.region));
  const [error, setError] = useState<string | null>(null);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    let period = { from, to };
    if (kind === 'month') period = months.find((o) => o.value === month)!.period;
    if (kind === 'quarter') period = quarters.find((o) => o.value === quarter)!.period;
    if (kind === 'season') period = seasons.find((o) => o.value === season)!.period;
    if (kind === 'custom') {
      if (!from || !to) return setError('Give both a first and a last day.');
      if (to < from) return setError('The last day must be on or after the first day.');
    }
    setError(null);
    router.push(
      viewHref(props.path, {
        ...period,
        region: region === '' ? undefined : Number(region),
        units: props.units,
      }),
    );
  };

  return (
    <form
      onSubmit={submit}
      aria-label="What to show"
      className="mb-6 flex flex-wrap items-end gap-x-4 gap-y-3 rounded-lg border border-sand-200 bg-white px-4 py-3 shadow-sm"
    >
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-kind`} className="text-sm font-medium text-slate-700">
          Period
        </label>
        <select
          id={`${id}-kind`}
          value={kind}
          onChange={(e) => setKind(e.target.value as PeriodKind)}
          className={field}
        >
          {(Object.keys(KIND_LABELS) as PeriodKind[]).map((k) => (
            <option key={k} value={k}>
              {KIND_LABELS[k]}
            </option>
          ))}
        </select>
      </div>
      {kind === 'month' && (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-month`} className="text-sm font-medium text-slate-700">
            Month
          </label>
          <select
            id={`${id}-month`}
            value={month}
            onChange={(e) => setMonth(e.target.value)}
            className={field}
          >
            {months.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
      )}
      {kind === 'quarter' && (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-quarter`} className="text-sm font-medium text-slate-700">
            Quarter
          </label>
          <select
            id={`${id}-quarter`}
            value={quarter}
            onChange={(e) => setQuarter(e.target.value)}
            className={field}
          >
            {quarters.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
      )}
      {kind === 'season' && (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-season`} className="text-sm font-medium text-slate-700">
            Season
          </label>
          <select
            id={`${id}-season`}
            value={season}
            onChange={(e) => setSeason(e.target.value)}
            className={field}
          >
            {seasons.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </div>
      )}
      {kind === 'custom' && (
        <>
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-from`} className="text-sm font-medium text-slate-700">
              First day
            </label>
            <input
              id={`${id}-from`}
              type="date"
              value={from}
              onChange={(e) => setFrom(e.target.value)}
              className={field}
              required
            />
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-to`} className="text-sm font-medium text-slate-700">
              Last day
            </label>
            <input
              id={`${id}-to`}
              type="date"
              value={to}
              min={from}
              onChange={(e) => setTo(e.target.value)}
              className={field}
              required
            />
          </div>
        </>
      )}
      {props.regions && props.regions.length > 1 && (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-region`} className="text-sm font-medium text-slate-700">
            Region
          </label>
          <select
            id={`${id}-region`}
            value={region}
            onChange={(e) => setRegion(e.target.value)}
            className={field}
          >
            <option value="">All regions</option>
            {props.regions.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </div>
      )}
      <button
        type="submit"
        className="min-h-11 rounded-md bg-sea-700 px-5 font-semibold text-white shadow-sm hover:bg-sea-800"
      >
        Show
      </button>
      {error && (
        <p role="alert" className="w-full text-brick-700">
          {error}
        </p>
      )}
    </form>
  );
}
