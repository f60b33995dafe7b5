'use client';

import { fieldId } from './check-in-fields';
import { CustomerSection } from './customer-section';
import { ReelSection } from './reel-section';
import { ServiceSection } from './service-section';
import { useCheckIn, type CheckInProps, type CheckInState } from './use-check-in';

export function CheckInForm(props: CheckInProps) {
  const form = useCheckIn(props);
  return (
    <form onSubmit={form.onSubmit} noValidate className="space-y-8">
      <ErrorSummary form={form} />
      <CustomerSection form={form} />
      {form.chosen !== null && <ReelSection form={form} />}
      <ServiceSection form={form} {...props} />
      <div className="flex flex-wrap items-center gap-4">
        <button
          type="submit"
          disabled={form.submitting}
          className="inline-flex min-h-14 items-center rounded-md bg-sea-700 px-8 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
        >
          {form.submitting ? 'Checking in…' : 'Check the reel in'}
        </button>
        <p className="text-slate-600">
          The job opens with the customer’s complaint and the promised date.
        </p>
      </div>
    </form>
  );
}

/** What a refused submit found, each message a link to its field. */
function ErrorSummary({ form }: { form: CheckInState }) {
  const messages = Object.entries(form.errors);
  if (messages.length === 0 && form.formError === null) return null;
  return (
    <div
      ref={form.summaryRef}
      tabIndex={-1}
      role="alert"
      className="rounded-lg border border-brick-200 bg-brick-50 px-5 py-4 text-brick-800"
    >
      <p className="font-semibold">
        {messages.length > 0 ? 'Some fields need attention.' : form.formError}
      </p>
      {messages.length > 0 && (
        <ul className="mt-2 list-disc space-y-1 pl-5">
          {messages.map(([path, message]) => (
            <li key={path}>
              <a href={`#${fieldId(path)}`} className="underline">
                {message}
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
