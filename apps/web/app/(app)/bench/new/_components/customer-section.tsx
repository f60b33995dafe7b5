'use client';

import type { ReactNode } from 'react';
import { FieldError, fieldId, inputClass, Section, TextField } from './check-in-fields';
import type { CheckInState } from './use-check-in';

const CUSTOMER_TEXT_FIELDS = [
  { key: 'name', label: 'Name' },
  { key: 'phone', label: 'Phone (optional)', type: 'tel', inputMode: 'tel' },
  {
    key: 'email',
    label: 'E-mail (optional)',
    type: 'email',
    inputMode: 'email',
    hint: 'We send the ready-for-pickup message here.',
  },
] as const;

/** Step 1: find the customer by name, phone or e-mail, or add a new one. */
export function CustomerSection({ form }: { form: CheckInState }) {
  const existing = form.chosen !== null && form.chosen !== 'new' ? form.chosen : null;
  return (
    <Section title="1. Customer" id="ci-section-customer">
      {existing ? (
        <Chosen onChange={form.clearCustomer}>
          <span className="block text-lg font-semibold">{existing.name}</span>
          <span className="block text-slate-700">
            {[existing.phone, existing.email].filter(Boolean).join(' · ') || 'No contact details'}
          </span>
        </Chosen>
      ) : form.chosen === 'new' ? (
        <NewCustomer form={form} />
      ) : (
        <CustomerSearch form={form} />
      )}
    </Section>
  );
}

function NewCustomer({ form }: { form: CheckInState }) {
  return (
    <div className="space-y-4">
      <div className="flex items-center justify-between gap-4">
        <p className="font-medium text-slate-800">New customer</p>
        <button
          type="button"
          onClick={() => form.setChosen(null)}
          className="min-h-11 rounded-md px-3 font-medium text-sea-700 underline underline-offset-2 hover:bg-sea-50"
        >
          Search again instead
        </button>
      </div>
      <div className="grid gap-4 md:grid-cols-3">
        {CUSTOMER_TEXT_FIELDS.map(({ key, ...field }) => (
          <TextField key={key} {...field} {...form.customerField(key)} autoComplete="off" />
        ))}
      </div>
      <label className="flex min-h-12 items-center gap-3 text-lg">
        <input
          type="checkbox"
          checked={form.customer.reminderConsent}
          onChange={(e) => form.editCustomer('reminderConsent', e.target.checked)}
          className="size-6 accent-sea-700"
        />
        Agrees to pre-season service reminders by e-mail
      </label>
    </div>
  );
}

function CustomerSearch({ form }: { form: CheckInState }) {
  const { query, setQuery, debounced, fetching, data } = form.customerSearch;
  const matches = data?.customers ?? [];
  const error = form.errors.customer;
  const id = fieldId('customer');
  return (
    <div>
      <label htmlFor={id} className="block font-medium text-slate-800">
        Find the customer
      </label>
      <p id={`${id}-hint`} className="text-sm text-slate-600">
        Type part of a name, phone number or e-mail address.
      </p>
      <input
        id={id}
        type="search"
        value={query}
        onChange={(e) => setQuery(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={[`${id}-hint`, error ? `${id}-error` : null].filter(Boolean).join(' ')}
        aria-controls="ci-customer-results"
        autoComplete="off"
        className={inputClass}
      />
      <FieldError path="customer" error={error} />
      <div id="ci-customer-results" aria-live="polite" className="mt-3">
        {debounced.length >= 2 && fetching && !data && <p className="text-slate-600">Searching…</p>}
        {debounced.length >= 2 && data && matches.length === 0 && (
          <p className="text-slate-700">No customer matches “{debounced}”.</p>
        )}
        {matches.length > 0 && (
          <ul className="grid gap-2 md:grid-cols-2" aria-label="Matching customers">
            {matches.map((c) => (
              <li key={c.id}>
                <button
                  type="button"
                  onClick={() => form.pickCustomer(c)}
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
        onClick={form.startNewCustomer}
        className="mt-4 inline-flex min-h-12 items-center rounded-md border border-sea-700 bg-white px-4 font-semibold text-sea-800 hover:bg-sea-50"
      >
        Add a new customer
      </button>
    </div>
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
