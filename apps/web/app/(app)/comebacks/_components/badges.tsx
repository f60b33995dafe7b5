import {
  ATTRIBUTION_LABELS,
  COMEBACK_STATUS_LABELS,
  type AttributionValue,
  type ComebackStatusValue,
} from '~/lib/comebacks';

// Badges always carry their words; colour only repeats what the words say.

const base =
  'inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset';

const STATUS_STYLES: Record<ComebackStatusValue, string> = {
  open: 'bg-brass-50 text-brass-900 ring-brass-300',
  confirmed: 'bg-sea-50 text-sea-800 ring-sea-200',
  dismissed: 'bg-slate-100 text-slate-700 ring-slate-300',
};

export function ComebackStatusBadge(props: {
  status: ComebackStatusValue;
  attribution?: AttributionValue | null;
}) {
  return (
    <span className={`${base} ${STATUS_STYLES[props.status]}`}>
      {COMEBACK_STATUS_LABELS[props.status]}
      {props.status === 'confirmed' && props.attribution
        ? `: ${ATTRIBUTION_LABELS[props.attribution].toLowerCase()}`
        : ''}
    </span>
  );
}

export function PastDeadlineBadge({ days }: { days?: number }) {
  return (
    <span className="inline-flex items-baseline gap-1 rounded-md bg-brick-700 px-2.5 py-0.5 text-sm font-medium text-white">
      <span aria-hidden="true">!</span> Past deadline
      {days !== undefined && days > 0 ? ` by ${days === 1 ? '1 day' : `${days} days`}` : ''}
    </span>
  );
}

export function CountedBadge() {
  return (
    <span className={`${base} bg-brick-50 text-brick-800 ring-brick-300`}>
      Counts in the comeback rate
    </span>
  );
}
