import type {
  AnswerResultValue,
  CorrectiveActionStatusValue,
  InspectionLevelValue,
  RoundStatusValue,
  SeverityValue,
  VerdictValue,
} from '~/lib/audits';

export const SEVERITY_LABELS: Record<SeverityValue, string> = {
  normal: 'Normal',
  tightened: 'Tightened',
  reduced: 'Reduced',
  discontinued: 'Discontinued',
};

export const ROUND_STATUS_LABELS: Record<RoundStatusValue, string> = {
  planned: 'Planned',
  in_progress: 'Being scored',
  decided: 'Decided',
  cancelled: 'Cancelled',
};

export const DECISION_LABELS = { accepted: 'Lot accepted', rejected: 'Lot rejected' } as const;

export const VERDICT_LABELS: Record<VerdictValue, string> = {
  meets_standard: 'Meets standard',
  needs_work: 'Needs work',
  critical_miss: 'Critical miss',
};

export const ANSWER_LABELS: Record<AnswerResultValue, string> = {
  pass: 'Pass',
  fail: 'Fail',
  not_applicable: 'Not applicable',
};

export const CORRECTIVE_ACTION_STATUS_LABELS: Record<CorrectiveActionStatusValue, string> = {
  open: 'Open',
  in_progress: 'In progress',
  done: 'Done',
  verified: 'Verified',
};

/** The standard writes special levels with a hyphen. */
export const levelLabel = (level: InspectionLevelValue) =>
  level.startsWith('S') ? `S-${level.slice(1)}` : level;
