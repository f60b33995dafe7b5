'use client';

import { JOB_STATE_LABELS, JOB_STATES, SERVICE_LABELS, type JobState } from '~/lib/labels';
import { SERVICE_TYPES } from '~/lib/jobs';

const fieldClass =
  'mt-1 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-base text-slate-900';
const labelClass = 'block text-sm font-medium text-slate-700';

type Update = (changes: Record<string, string | undefined>) => void;

/** The search box and filters above the bench list; each change rewrites the URL. */
export function JobFilters(props: {
  params: Record<string, string>;
  update: Update;
  text: string;
  setText: (text: string) => void;
  shops: { id: number; name: string }[];
  technicians: { id: number; name: string }[];
  states: JobState[];
  toggleState: (state: JobState) => void;
  filtered: boolean;
  onClear: () => void;
}) {
  const { params, update } = props;
  const multiShop = props.shops.length > 1;
  return (
    <form
      role="search"
      aria-label="Filter jobs"
      className="space-y-4 border-b border-sand-200 p-5"
      onSubmit={(e) => {
        e.preventDefault();
        update({ q: props.text.trim() || undefined });
      }}
    >
      <div
        className={`grid gap-4 md:grid-cols-2 ${multiShop ? 'lg:grid-cols-4' : 'lg:grid-cols-[2fr_1fr_1fr]'}`}
      >
        <div className={multiShop ? '' : 'md:col-span-2 lg:col-span-1'}>
          <label htmlFor="job-search" className={labelClass}>
            Search
          </label>
          <input
            id="job-search"
            type="search"
            value={props.text}
            onChange={(e) => props.setText(e.target.value)}
            placeholder="Name, phone, e-mail, reel or #job"
            className={fieldClass}
          />
        </div>
        {multiShop && (
          <FilterSelect
            id="job-shop"
            label="Shop"
            value={params.shopId}
            onChange={(v) => update({ shopId: v, technicianId: undefined })}
            anyLabel="All shops"
            options={props.shops.map((s) => [s.id, s.name])}
          />
        )}
        <FilterSelect
          id="job-technician"
          label="Technician"
          value={params.technicianId}
          onChange={(v) => update({ technicianId: v })}
          anyLabel="Anyone"
          options={props.technicians.map((t) => [t.id, t.name])}
        />
        <FilterSelect
          id="job-service"
          label="Service"
          value={params.service}
          onChange={(v) => update({ service: v })}
          anyLabel="Any service"
          options={SERVICE_TYPES.map((s) => [s, SERVICE_LABELS[s]])}
        />
      </div>
      <div className="flex flex-wrap items-end gap-x-6 gap-y-4">
        <fieldset>
          <legend className={labelClass}>State</legend>
          <div className="mt-1 flex flex-wrap gap-2">
            {JOB_STATES.map((s) => (
              <button
                key={s}
                type="button"
                aria-pressed={props.states.includes(s)}
                onClick={() => props.toggleState(s)}
                className="inline-flex min-h-11 items-center rounded-full border border-slate-400 bg-white px-4 font-medium text-slate-800 hover:bg-sand-100 aria-pressed:border-sea-700 aria-pressed:bg-sea-700 aria-pressed:text-white"
              >
                {JOB_STATE_LABELS[s]}
              </button>
            ))}
          </div>
        </fieldset>
        <FilterInput
          id="job-waiting"
          label="In state more than (days)"
          className="w-48"
          type="number"
          inputMode="numeric"
          min={1}
          max={365}
          value={params.waitingDays}
          onChange={(v) => update({ waitingDays: v })}
        />
        <div className="flex gap-3">
          <FilterInput
            id="job-from"
            label="Checked in from"
            type="date"
            value={params.from}
            onChange={(v) => update({ from: v })}
          />
          <FilterInput
            id="job-to"
            label="to"
            type="date"
            value={params.to}
            onChange={(v) => update({ to: v })}
          />
        </div>
        {props.filtered && (
          <button
            type="button"
            onClick={props.onClear}
            className="inline-flex min-h-12 items-center rounded-md px-3 font-medium text-sea-700 underline underline-offset-2 hover:bg-sea-50"
          >
            Clear filters
          </button>
        )}
      </div>
    </form>
  );
}

/** A labelled select whose empty first option means "no filter". */
function FilterSelect(props: {
  id: string;
  label: string;
  value: string | undefined;
  onChange: (value: string) => void;
  anyLabel: string;
  options: [value: string | number, label: string][];
}) {
  return (
    <div>
      <label htmlFor={props.id} className={labelClass}>
        {props.label}
      </label>
      <select
        id={props.id}
        value={props.value ?? ''}
        onChange={(e) => props.onChange(e.target.value)}
        className={fieldClass}
      >
        <option value="">{props.anyLabel}</option>
        {props.options.map(([value, label]) => (
          <option key={value} value={value}>
            {label}
          </option>
        ))}
      </select>
    </div>
  );
}

function FilterInput(props: {
  id: string;
  label: string;
  type: 'number' | 'date';
  value: string | undefined;
  onChange: (value: string) => void;
  className?: string;
  inputMode?: 'numeric';
  min?: number;
  max?: number;
}) {
  return (
    <div className={props.className}>
      <label htmlFor={props.id} className={labelClass}>
        {props.label}
      </label>
      <input
        id={props.id}
        type={props.type}
        inputMode={props.inputMode}
        min={props.min}
        max={props.max}
        value={props.value ?? ''}
        onChange={(e) => props.onChange(e.target.value)}
        className={fieldClass}
      />
    </div>
  );
}
