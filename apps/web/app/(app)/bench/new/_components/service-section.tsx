'use client';

import { SERVICE_LABELS } from '~/lib/labels';
import { SERVICE_TYPES } from '~/lib/jobs';
import {
  Choice,
  ChoiceFieldset,
  Field,
  inputClass,
  Section,
  TextArea,
  TextField,
} from './check-in-fields';
import type { CheckInProps, CheckInState } from './use-check-in';

const SERVICE_HINTS: Record<(typeof SERVICE_TYPES)[number], string> = {
  tune_up: 'Clean, lubricate, adjust',
  overhaul: 'Full teardown and rebuild',
  repair: 'Fix a fault, billed by bench time',
  parts_install: 'Fit parts the customer brings',
};

/** The last step: which service, what the customer says, who takes it and when it is promised. */
export function ServiceSection({
  form,
  technicians,
  me,
  suggestion,
}: CheckInProps & { form: CheckInState }) {
  return (
    <Section
      title={form.chosen !== null ? '3. Service and pickup' : '2. Service and pickup'}
      id="ci-section-service"
    >
      <ChoiceFieldset
        path="serviceType"
        legend="Which service?"
        error={form.errors.serviceType}
        columns="sm:grid-cols-2 lg:grid-cols-4"
      >
        {SERVICE_TYPES.map((s) => (
          <Choice
            key={s}
            name="serviceType"
            checked={form.serviceType === s}
            onChange={() => form.pickService(s)}
          >
            <span className="block font-semibold">{SERVICE_LABELS[s]}</span>
            <span className="block text-sm text-slate-700">{SERVICE_HINTS[s]}</span>
          </Choice>
        ))}
      </ChoiceFieldset>
      <div className="mt-6 grid gap-4 md:grid-cols-2">
        <TextArea label="What the customer says" {...form.complaint} />
        <TextArea
          label="Condition at check-in"
          {...form.condition}
          hint="Scratches, salt crust, missing parts: anything the customer should know we saw."
        />
      </div>
      <div className="mt-6 grid gap-4 md:grid-cols-2">
        <Field path="technicianId" label="Technician" error={form.errors.technicianId}>
          {(c) => (
            <select
              id={c.id}
              value={form.technicianId}
              onChange={(e) => form.setTechnicianId(e.target.value)}
              aria-invalid={c.invalid}
              aria-describedby={c.describedBy}
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
          )}
        </Field>
        <TextField
          label="Promised for pickup"
          type="date"
          {...form.promisedOn}
          min={suggestion.today}
          hint={suggestionText(suggestion)}
        />
      </div>
    </Section>
  );
}

function suggestionText(s: CheckInProps['suggestion']) {
  const days = s.businessDays === 1 ? '1 business day' : `${s.businessDays} business days`;
  if (s.basis === 'default')
    return `Suggested: ${days}. Too few finished jobs yet to go by this shop’s own turnaround.`;
  const from = s.basis === 'recent' ? 'in the last 90 days' : 'most recently';
  return `Suggested: ${days}. 9 in 10 of the ${s.sampleSize} jobs finished here ${from} took no longer on the bench (time waiting on parts left out). Change it if you agree another date.`;
}
