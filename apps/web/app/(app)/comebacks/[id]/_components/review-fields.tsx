import type { ReactNode } from 'react';
import type { AttributionValue } from '~/lib/comebacks';

// The review form's small pieces: choice cards, field errors and the words they use.

export const ATTRIBUTION_HINTS: Record<AttributionValue, string> = {
  workmanship: 'The service missed or did something wrong',
  part_failure: 'A part the shop fitted failed',
  customer_damage: 'Dropped, salted, opened or misused since',
  unrelated: 'A different fault from the one serviced',
  undetermined: 'The cause cannot be told',
};

export const FIELD_NAMES: Record<string, string> = {
  dismissReason: 'Why it is dismissed',
  dismissNote: 'Note',
  attribution: 'Attribution',
  rootCauseId: 'Root cause',
  rootCauseNote: 'What was found',
  checklistStepId: 'Checklist step',
  disposition: 'Disposition',
  correctiveAction: 'Corrective action',
  'correctiveAction.title': 'Corrective action title',
  'correctiveAction.ownerId': 'Corrective action owner',
  'correctiveAction.dueOn': 'Corrective action due date',
};

export const input =
  'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3 aria-invalid:border-brick-600';

export function Choice(props: {
  name: string;
  checked: boolean;
  onChange: () => void;
  children: ReactNode;
  describedBy?: string;
}) {
  return (
    <label className="flex min-h-12 cursor-pointer items-start gap-3 rounded-md border border-sand-300 bg-white px-4 py-2.5 has-checked:border-sea-700 has-checked:bg-sea-50 has-checked:ring-1 has-checked:ring-sea-700">
      <input
        type="radio"
        name={props.name}
        checked={props.checked}
        onChange={props.onChange}
        aria-describedby={props.describedBy}
        className="mt-1 size-5 shrink-0 accent-sea-700"
      />
      <span>{props.children}</span>
    </label>
  );
}

export function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <p id={id} className="mt-1 font-medium text-brick-700">
      {message}
    </p>
  );
}
