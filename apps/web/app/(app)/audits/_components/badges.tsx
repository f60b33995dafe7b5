import type {
  CorrectiveActionStatusValue,
  RoundStatusValue,
  SeverityValue,
  VerdictValue,
} from '~/lib/audits';
import {
  CORRECTIVE_ACTION_STATUS_LABELS,
  DECISION_LABELS,
  ROUND_STATUS_LABELS,
  SEVERITY_LABELS,
  VERDICT_LABELS,
} from './labels';

// Badges always carry their words; colour only repeats what the words say.

const base =
  'inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset';

const SEVERITY_STYLES: Record<SeverityValue, string> = {
  normal: 'bg-slate-100 text-slate-800 ring-slate-300',
  tightened: 'bg-amber-50 text-amber-900 ring-amber-300',
  reduced: 'bg-sea-50 text-sea-800 ring-sea-200',
  discontinued: 'bg-brick-50 text-brick-800 ring-brick-300',
};

export function SeverityBadge({ severity }: { severity: SeverityValue }) {
  return (
    <span className={`${base} ${SEVERITY_STYLES[severity]}`}>
      {SEVERITY_LABELS[severity]} inspection
    </span>
  );
}

const VERDICT_STYLES: Record<VerdictValue, string> = {
  meets_standard: 'bg-sea-50 text-sea-800 ring-sea-200',
  needs_work: 'bg-amber-50 text-amber-900 ring-amber-300',
  critical_miss: 'bg-brick-50 text-brick-800 ring-brick-300',
};

export function VerdictBadge({ verdict }: { verdict: VerdictValue }) {
  return <span className={`${base} ${VERDICT_STYLES[verdict]}`}>{VERDICT_LABELS[verdict]}</span>;
}

export function RoundStatusBadge(props: {
  status: RoundStatusValue;
  decision: 'accepted' | 'rejected' | null;
}) {
  if (props.status === 'decided' && props.decision) {
    const style =
      props.decision === 'accepted'
        ? 'bg-sea-700 text-white ring-sea-700'
        : 'bg-brick-700 text-white ring-brick-700';
    return <span className={`${base} ${style}`}>{DECISION_LABELS[props.decision]}</span>;
  }
  const style =
    props.status === 'in_progress'
      ? 'bg-brass-50 text-brass-800 ring-brass-200'
      : 'bg-sand-100 text-slate-800 ring-sand-300';
  return <span className={`${base} ${style}`}>{ROUND_STATUS_LABELS[props.status]}</span>;
}

const CA_STYLES: Record<CorrectiveActionStatusValue, string> = {
  open: 'bg-sand-100 text-slate-800 ring-sand-300',
  in_progress: 'bg-brass-50 text-brass-800 ring-brass-200',
  done: 'bg-sea-50 text-sea-800 ring-sea-200',
  verified: 'bg-sea-700 text-white ring-sea-700',
};

export function CorrectiveActionStatusBadge({ status }: { status: CorrectiveActionStatusValue }) {
  return (
    <span className={`${base} ${CA_STYLES[status]}`}>
      {CORRECTIVE_ACTION_STATUS_LABELS[status]}
    </span>
  );
}

export function OverdueBadge() {
  return <span className={`${base} bg-brick-700 text-white ring-brick-700`}>Overdue</span>;
}
