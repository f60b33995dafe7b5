'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useEffect, useRef, useState, type FormEvent, type ReactNode } from 'react';
import type { ZodError } from 'zod';
import { ProblemError } from '~/lib/api-client';
import { REEL_KIND_LABELS, SERVICE_LABELS } from '~/lib/labels';
import {
  customerSearchQuery,
  jobKeys,
  sendJson,
  type CustomerMatchJson,
  type JobDetailJson,
} from '~/lib/queries/jobs';
import {
  checkInInput,
  customerInput,
  REEL_KINDS,
  reelInput,
  SERVICE_TYPES,
} from '~/lib/validators/jobs';
import { formatCivilDate, USE_LABELS, WATER_LABELS } from '../../_components/format';

interface Props {
  technicians: { id: number; name: string }[];
  me: { id: number; role: string };
  suggestion: {
    promisedOn: string;
    businessDays: number;
    basis: 'recent' | 'history' | 'default';
    sampleSize: number;
    today: string;
  };
}

type Errors = Record<string, string>;

const fieldId = (path: string) => `ci-${path.replace(/\./g, '-')}`;
const inputClass =
  'mt-1.5 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-lg text-slate-900 aria-invalid:border-brick-600';

const SERVICE_HINTS: Record<(typeof SERVICE_TYPES)[number], string> = {
  tune_up: 'Clean, lubricate, adjust',
  overhaul: 'Full teardown and rebuild',
  repair: 'Fix a fault, billed by bench time',
  parts_install: 'Fit parts the customer brings',
};

function collect(error: ZodError, prefix: string, into: Errors) {
  for (const issue of error.issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join('.');
    into[key] ??= issue.message;
  }
}

const blankCustomer = { name: '', phone: '', email: '', reminderConsent: false };
const blankReel = {
  kind: '',
  maker: '',
  model: '',
  size: '',
  bearingCount: '',
  gearRatio: '',
  useProfile: 'light',
  water: 'fresh',
};

export function CheckInForm({ technicians, me, suggestion }: Props) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [query, setQuery] = useState('');
  const [debounced, setDebounced] = useState('');
  const [chosen, setChosen] = useState<CustomerMatchJson | 'new' | null>(null);
  const [customer, setCustomer] = useState(blankCustomer);
  const [reelChoice, setReelChoice] = useState<number | 'new' | null>(null);
  const [reel, setReel] = useState(blankReel);
  const [serviceType, setServiceType] = useState('');
  const [complaint, setComplaint] = useState('');
  const [condition, setCondition] = useState('');
  const [technicianId, setTechnicianId] = useState(me.role === 'technician' ? String(me.id) : '');
  const [promisedOn, setPromisedOn] = useState(suggestion.promisedOn);
  const [errors, setErrors] = useState<Errors>({});
  const [formError, setFormError] = useState<string | null>(null);
  const summaryRef = useRef<HTMLDivElement>(null);
  const [attempt, setAttempt] = useState(0);
  // A field's message goes as soon as it is edited; the rest stay until the next submit.
  const touch = (...paths: string[]) =>
    setErrors((e) => {
      if (!paths.some((p) => p in e)) return e;
      const rest = { ...e };
      for (const p of paths) delete rest[p];
      return rest;
    });
  const editCustomer = (key: keyof typeof blankCustomer, value: string | boolean) => {
    setCustomer((c) => ({ ...c, [key]: value }));
    touch(`customer.${key}`);
  };
  const editReel = (key: keyof typeof blankReel, value: string) => {
    setReel((r) => ({ ...r, [key]: value }));
    touch(`reel.${key}`);
  };

  useEffect(() => {
    const timer = setTimeout(() => setDebounced(query.trim()), 250);
    return () => clearTimeout(timer);
  }, [query]);
  const search = useQuery(customerSearchQuery(debounced));

  const submit = useMutation({
    mutationFn: (body: unknown) => sendJson<JobDetailJson>('POST', '/api/jobs', body),
    onSuccess: (job) => {
      queryClient.setQueryData(jobKeys.detail(job.id), job);
      void queryClient.invalidateQueries({ queryKey: jobKeys.lists });
      router.push(`/bench/jobs/${job.id}`);
    },
    onError: (error) => {
      setAttempt((n) => n + 1);
      if (error instanceof ProblemError && error.problem.errors?.length) {
        const next: Errors = {};
        for (const e of error.problem.errors) next[e.field.replace(/^body\./, '')] ??= e.message;
        setErrors(next);
        setFormError(null);
      } else {
        setFormError(error.message);
      }
    },
  });

  const hasErrors = Object.keys(errors).length > 0 || formError !== null;
  // Each refused submit moves focus to the summary, so a screen reader hears what to fix.
  useEffect(() => {
    if (attempt > 0) summaryRef.current?.focus();
  }, [attempt]);

  function startNewCustomer() {
    touch('customer');
    const q = query.trim();
    setChosen('new');
    setReelChoice('new');
    setCustomer({
      ...blankCustomer,
      name: /@|\d/.test(q) ? '' : q,
      email: q.includes('@') ? q : '',
      phone: /^[\d+() .-]+$/.test(q) ? q : '',
    });
  }

  function pickCustomer(c: CustomerMatchJson) {
    touch('customer');
    setChosen(c);
    setReelChoice(c.reels.length === 1 ? c.reels[0]!.id : c.reels.length === 0 ? 'new' : null);
  }

  function onSubmit(event: FormEvent) {
    event.preventDefault();
    setAttempt((n) => n + 1);
    const next: Errors = {};
    let customerBody: unknown;
    if (chosen === null) next.customer = 'Find the customer, or add a new one';
    else if (chosen === 'new') {
      const parsed = customerInput.safeParse(customer);
      if (parsed.success) customerBody = parsed.data;
      else collect(parsed.error, 'customer', next);
    } else customerBody = { id: chosen.id };

    let reelBody: unknown;
    if (chosen !== null) {
      if (reelChoice === null) next.reel = 'Pick the reel, or add it';
      else if (reelChoice === 'new') {
        const raw = {
          ...reel,
          kind: reel.kind || undefined,
          bearingCount: reel.bearingCount === '' ? undefined : Number(reel.bearingCount),
        };
        const parsed = reelInput.safeParse(raw);
        if (parsed.success) reelBody = parsed.data;
        else collect(parsed.error, 'reel', next);
      } else reelBody = { id: reelChoice };
    }

    const rest = checkInInput
      .pick({
        serviceType: true,
        complaint: true,
        condition: true,
        technicianId: true,
        promisedOn: true,
      })
      .safeParse({
        serviceType: serviceType || undefined,
        complaint,
        condition,
        technicianId: technicianId ? Number(technicianId) : undefined,
        promisedOn,
      });
    if (!rest.success) collect(rest.error, '', next);
    if (promisedOn && promisedOn < suggestion.today)
      next.promisedOn ??= 'The promised date cannot be in the past';

    setErrors(next);
    setFormError(null);
    if (Object.keys(next).length > 0 || !rest.success) return;
    submit.mutate({ customer: customerBody, reel: reelBody, ...rest.data });
  }

  const err = (path: string) => errors[path];
  const described = (path: string, hint?: boolean) =>
    [hint ? `${fieldId(path)}-hint` : null, errors[path] ? `${fieldId(path)}-error` : null]
      .filter(Boolean)
      .join(' ') || undefined;

  const matches = search.data?.customers ?? [];
  const existing = chosen !== null && chosen !== 'new' ? chosen : null;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-8">
      {hasErrors && (
        <div
          ref={summaryRef}
          tabIndex={-1}
          role="alert"
          className="rounded-lg border border-brick-200 bg-brick-50 px-5 py-4 text-brick-800"
        >
          <p className="font-semibold">
            {Object.keys(errors).length > 0 ? 'Some fields need attention.' : formError}
          </p>
          {Object.keys(errors).length > 0 && (
            <ul className="mt-2 list-disc space-y-1 pl-5">
              {Object.entries(errors).map(([path, message]) => (
                <li key={path}>
                  <a href={`#${fieldId(path)}`} className="underline">
                    {message}
                  </a>
                </li>
              ))}
            </ul>
          )}
        </div>
      )}

      <Section title="1. Customer" id="ci-section-customer">
        {existing ? (
          <Chosen
            onChange={() => {
              setChosen(null);
              setReelChoice(null);
            }}
          >
            <span className="block text-lg font-semibold">{existing.name}</span>
            <span className="block text-slate-700">
              {[existing.phone, existing.email].filter(Boolean).join(' · ') || 'No contact details'}
            </span>
          </Chosen>
        ) : chosen === 'new' ? (
          <div className="space-y-4">
            <div className="flex items-center justify-between gap-4">
              <p className="font-medium text-slate-800">New customer</p>
              <button
                type="button"
                onClick={() => setChosen(null)}
                className="min-h-11 rounded-md px-3 font-medium text-sea-700 underline underline-offset-2 hover:bg-sea-50"
              >
                Search again instead
              </button>
            </div>
            <div className="grid gap-4 md:grid-cols-3">
              <TextField
                path="customer.name"
                label="Name"
                value={customer.name}
                onChange={(v) => editCustomer('name', v)}
                error={err('customer.name')}
                autoComplete="off"
              />
              <TextField
                path="customer.phone"
                label="Phone (optional)"
                type="tel"
                inputMode="tel"
                value={customer.phone}
                onChange={(v) => editCustomer('phone', v)}
                error={err('customer.phone')}
                autoComplete="off"
              />
              <TextField
                path="customer.email"
                label="E-mail (optional)"
                type="email"
                inputMode="email"
                value={customer.email}
                onChange={(v) => editCustomer('email', v)}
                error={err('customer.email')}
                hint="We send the ready-for-pickup message here."
                autoComplete="off"
              />
            </div>
            <label className="flex min-h-12 items-center gap-3 text-lg">
              <input
                type="checkbox"
                checked={customer.reminderConsent}
                onChange={(e) => editCustomer('reminderConsent', e.target.checked)}
                className="size-6 accent-sea-700"
              />
              Agrees to pre-season service reminders by e-mail
            </label>
          </div>
        ) : (
          <div>
            <label htmlFor={fieldId('customer')} className="block font-medium text-slate-800">
              Find the customer
            </label>
            <p id={`${fieldId('customer')}-hint`} className="text-sm text-slate-600">
              Type part of a name, phone number or e-mail address.
            </p>
            <input
              id={fieldId('customer')}
              type="search"
              value={query}
              onChange={(e) => setQuery(e.target.value)}
              aria-invalid={err('customer') ? true : undefined}
              aria-describedby={described('customer', true)}
              aria-controls="ci-customer-results"
              autoComplete="off"
              className={inputClass}
            />
            <FieldError path="customer" error={err('customer')} />
            <div id="ci-customer-results" aria-live="polite" className="mt-3">
              {debounced.length >= 2 && search.isFetching && !search.data && (
                <p className="text-slate-600">Searching…</p>
              )}
              {debounced.length >= 2 && search.data && matches.length === 0 && (
                <p className="text-slate-700">No customer matches “{debounced}”.</p>
              )}
              {matches.length > 0 && (
                <ul className="grid gap-2 md:grid-cols-2" aria-label="Matching customers">
                  {matches.map((c) => (
                    <li key={c.id}>
                      <button
                        type="button"
                        onClick={() => pickCustomer(c)}
                        className="block min-h-14 w-full rounded-md border border-sand-300 bg-sand-50 px-4 py-2 text-left hover:border-sea-600 hover:bg-sea-50"
                      >
                        <span className="block font-semibold">{c.name}</span>
                        <span className="block text-sm text-slate-700">
                          {[c.phone, c.email].filter(Boolean).join(' · ') || 'No contact details'}
                          {' · '}
                          {c.reels.length === 1 ? '1 reel' : `${c.reels.length} reels`}
                        </span>
                      </button>
                    </li>
                  ))}
                </ul>
              )}
            </div>
            <button
              type="button"
              onClick={startNewCustomer}
              className="mt-4 inline-flex min-h-12 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50"
            >
              Add a new customer
            </button>
          </div>
        )}
      </Section>

      {chosen !== null && (
        <Section title="2. Reel" id="ci-section-reel">
          {existing && existing.reels.length > 0 && (
            <fieldset aria-describedby={err('reel') ? `${fieldId('reel')}-error` : undefined}>
              <legend id={fieldId('reel')} tabIndex={-1} className="font-medium text-slate-800">
                Which reel?
              </legend>
              <div className="mt-2 grid gap-2 md:grid-cols-2">
                {existing.reels.map((r) => (
                  <Choice
                    key={r.id}
                    name="reel"
                    checked={reelChoice === r.id}
                    onChange={() => {
                      setReelChoice(r.id);
                      touch('reel');
                    }}
                  >
                    <span className="block font-semibold">
                      {r.maker} {r.model} {r.size}
                    </span>
                    <span className="block text-sm text-slate-700">
                      {REEL_KIND_LABELS[r.kind as keyof typeof REEL_KIND_LABELS]} ·{' '}
                      {WATER_LABELS[r.water]} · {USE_LABELS[r.useProfile]}
                      {r.lastServicedOn
                        ? ` · last serviced ${formatCivilDate(r.lastServicedOn)}`
                        : ''}
                    </span>
                  </Choice>
                ))}
                <Choice
                  name="reel"
                  checked={reelChoice === 'new'}
                  onChange={() => {
                    setReelChoice('new');
                    touch('reel');
                  }}
                >
                  <span className="block font-semibold">Another reel</span>
                  <span className="block text-sm text-slate-700">Add it below</span>
                </Choice>
              </div>
              <FieldError path="reel" error={err('reel')} />
            </fieldset>
          )}
          {reelChoice === 'new' && (
            <div className={`grid gap-4 md:grid-cols-3 ${existing?.reels.length ? 'mt-6' : ''}`}>
              <div>
                <label htmlFor={fieldId('reel.kind')} className="block font-medium text-slate-800">
                  Kind
                </label>
                <select
                  id={fieldId('reel.kind')}
                  value={reel.kind}
                  onChange={(e) => editReel('kind', e.target.value)}
                  aria-invalid={err('reel.kind') ? true : undefined}
                  aria-describedby={described('reel.kind')}
                  className={inputClass}
                >
                  <option value="">Choose…</option>
                  {REEL_KINDS.map((k) => (
                    <option key={k} value={k}>
                      {REEL_KIND_LABELS[k]}
                    </option>
                  ))}
                </select>
                <FieldError path="reel.kind" error={err('reel.kind')} />
              </div>
              <TextField
                path="reel.maker"
                label="Maker"
                value={reel.maker}
                onChange={(v) => editReel('maker', v)}
                error={err('reel.maker')}
              />
              <TextField
                path="reel.model"
                label="Model"
                value={reel.model}
                onChange={(v) => editReel('model', v)}
                error={err('reel.model')}
              />
              <TextField
                path="reel.size"
                label="Size (optional)"
                value={reel.size}
                onChange={(v) => editReel('size', v)}
                error={err('reel.size')}
                hint="As printed, e.g. 4000 or 30W"
              />
              <TextField
                path="reel.bearingCount"
                label="Bearings (optional)"
                inputMode="numeric"
                value={reel.bearingCount}
                onChange={(v) => editReel('bearingCount', v)}
                error={err('reel.bearingCount')}
              />
              <TextField
                path="reel.gearRatio"
                label="Gear ratio (optional)"
                value={reel.gearRatio}
                onChange={(v) => editReel('gearRatio', v)}
                error={err('reel.gearRatio')}
                hint="As printed, e.g. 6.2:1"
              />
              <fieldset>
                <legend className="font-medium text-slate-800">Use</legend>
                <div className="mt-1.5 flex gap-2">
                  {(['light', 'heavy'] as const).map((u) => (
                    <Choice
                      key={u}
                      name="useProfile"
                      checked={reel.useProfile === u}
                      onChange={() => editReel('useProfile', u)}
                    >
                      <span className="whitespace-nowrap">{USE_LABELS[u]}</span>
                    </Choice>
                  ))}
                </div>
              </fieldset>
              <fieldset>
                <legend className="font-medium text-slate-800">Water</legend>
                <div className="mt-1.5 flex gap-2">
                  {(['salt', 'fresh'] as const).map((w) => (
                    <Choice
                      key={w}
                      name="water"
                      checked={reel.water === w}
                      onChange={() => editReel('water', w)}
                    >
                      <span className="whitespace-nowrap">{WATER_LABELS[w]}</span>
                    </Choice>
                  ))}
                </div>
              </fieldset>
            </div>
          )}
        </Section>
      )}

      <Section
        title={chosen !== null ? '3. Service and pickup' : '2. Service and pickup'}
        id="ci-section-service"
      >
        <fieldset
          aria-describedby={err('serviceType') ? `${fieldId('serviceType')}-error` : undefined}
        >
          <legend id={fieldId('serviceType')} tabIndex={-1} className="font-medium text-slate-800">
            Which service?
          </legend>
          <div className="mt-2 grid gap-2 sm:grid-cols-2 lg:grid-cols-4">
            {SERVICE_TYPES.map((s) => (
              <Choice
                key={s}
                name="serviceType"
                checked={serviceType === s}
                onChange={() => {
                  setServiceType(s);
                  touch('serviceType');
                }}
              >
                <span className="block font-semibold">{SERVICE_LABELS[s]}</span>
                <span className="block text-sm text-slate-700">{SERVICE_HINTS[s]}</span>
              </Choice>
            ))}
          </div>
          <FieldError path="serviceType" error={err('serviceType')} />
        </fieldset>
        <div className="mt-6 grid gap-4 md:grid-cols-2">
          <TextArea
            path="complaint"
            label="What the customer says"
            value={complaint}
            onChange={(v) => {
              setComplaint(v);
              touch('complaint');
            }}
            error={err('complaint')}
          />
          <TextArea
            path="condition"
            label="Condition at check-in"
            value={condition}
            onChange={(v) => {
              setCondition(v);
              touch('condition');
            }}
            error={err('condition')}
            hint="Scratches, salt crust, missing parts: anything the customer should know we saw."
          />
        </div>
        <div className="mt-6 grid gap-4 md:grid-cols-2">
          <div>
            <label htmlFor={fieldId('technicianId')} className="block font-medium text-slate-800">
              Technician
            </label>
            <select
              id={fieldId('technicianId')}
              value={technicianId}
              onChange={(e) => setTechnicianId(e.target.value)}
              aria-describedby={described('technicianId')}
              className={inputClass}
            >
              <option value="">Not assigned yet</option>
              {technicians.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                  {t.id === me.id ? ' (you)' : ''}
                </option>
              ))}
            </select>
            <FieldError path="technicianId" error={err('technicianId')} />
          </div>
          <TextField
            path="promisedOn"
            label="Promised for pickup"
            type="date"
            value={promisedOn}
            min={suggestion.today}
            onChange={(v) => {
              setPromisedOn(v);
              touch('promisedOn');
            }}
            error={err('promisedOn')}
            hint={suggestionText(suggestion)}
          />
        </div>
      </Section>

      <div className="flex flex-wrap items-center gap-4">
        <button
          type="submit"
          disabled={submit.isPending}
          className="inline-flex min-h-14 items-center rounded-md bg-sea-700 px-8 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
        >
          {submit.isPending ? 'Checking in…' : 'Check the reel in'}
        </button>
        <p className="text-slate-600">
          The job opens with the customer’s complaint and the promised date.
        </p>
      </div>
    </form>
  );
}

function suggestionText(s: Props['suggestion']) {
  const days = s.businessDays === 1 ? '1 business day' : `${s.businessDays} business days`;
  if (s.basis === 'default')
    return `Suggested: ${days}. Too few finished jobs yet to go by this shop’s own turnaround.`;
  const from = s.basis === 'recent' ? 'in the last 90 days' : 'most recently';
  return `Suggested: ${days}. 9 in 10 of the ${s.sampleSize} jobs finished here ${from} took no longer on the bench (time waiting on parts left out). Change it if you agree another date.`;
}

function Section(props: { title: string; id: string; children: ReactNode }) {
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

function Chosen(props: { children: ReactNode; onChange: () => void }) {
  return (
    <div className="flex flex-wrap items-center justify-between gap-4 rounded-md border border-sea-200 bg-sea-50 px-4 py-3">
      <div>{props.children}</div>
      <button
        type="button"
        onClick={props.onChange}
        className="min-h-11 rounded-md px-3 font-medium text-sea-800 underline underline-offset-2 hover:bg-sea-100"
      >
        Change customer
      </button>
    </div>
  );
}

function Choice(props: {
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

function FieldError({ path, error }: { path: string; error?: string }) {
  if (!error) return null;
  return (
    <p id={`${fieldId(path)}-error`} className="mt-1 text-brick-700">
      {error}
    </p>
  );
}

function TextField(props: {
  path: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  error?: string;
  hint?: string;
  type?: string;
  inputMode?: 'numeric' | 'tel' | 'email';
  autoComplete?: string;
  min?: string;
}) {
  const id = fieldId(props.path);
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        {props.label}
      </label>
      <input
        id={id}
        type={props.type ?? 'text'}
        inputMode={props.inputMode}
        value={props.value}
        min={props.min}
        autoComplete={props.autoComplete}
        onChange={(e) => props.onChange(e.target.value)}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={
          [props.hint ? `${id}-hint` : null, props.error ? `${id}-error` : null]
            .filter(Boolean)
            .join(' ') || undefined
        }
        className={inputClass}
      />
      {props.hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-slate-600">
          {props.hint}
        </p>
      )}
      <FieldError path={props.path} error={props.error} />
    </div>
  );
}

function TextArea(props: {
  path: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  error?: string;
  hint?: string;
}) {
  const id = fieldId(props.path);
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        {props.label}
      </label>
      <textarea
        id={id}
        rows={3}
        value={props.value}
        onChange={(e) => props.onChange(e.target.value)}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={
          [props.hint ? `${id}-hint` : null, props.error ? `${id}-error` : null]
            .filter(Boolean)
            .join(' ') || undefined
        }
        className="mt-1.5 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 text-lg text-slate-900 aria-invalid:border-brick-600"
      />
      {props.hint && (
        <p id={`${id}-hint`} className="mt-1 text-sm text-slate-600">
          {props.hint}
        </p>
      )}
      <FieldError path={props.path} error={props.error} />
    </div>
  );
}
