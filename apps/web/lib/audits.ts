// The audit screens' closed sets and rules, free of zod, so that pages in the browser can use
// them; lib/validators/audits.ts builds the request schemas from them.
import { AQLS } from '@reelwright/metrics';

export const INSPECTION_LEVELS = ['I', 'II', 'III', 'S1', 'S2', 'S3', 'S4'] as const;
export type InspectionLevelValue = (typeof INSPECTION_LEVELS)[number];
export const SEVERITIES = ['normal', 'tightened', 'reduced', 'discontinued'] as const;
export type SeverityValue = (typeof SEVERITIES)[number];
export const ROUND_STATUSES = ['planned', 'in_progress', 'decided', 'cancelled'] as const;
export type RoundStatusValue = (typeof ROUND_STATUSES)[number];
export const ANSWER_RESULTS = ['pass', 'fail', 'not_applicable'] as const;
export type AnswerResultValue = (typeof ANSWER_RESULTS)[number];
export const VERDICTS = ['meets_standard', 'needs_work', 'critical_miss'] as const;
export type VerdictValue = (typeof VERDICTS)[number];
export const CORRECTIVE_ACTION_STATUSES = ['open', 'in_progress', 'done', 'verified'] as const;
export type CorrectiveActionStatusValue = (typeof CORRECTIVE_ACTION_STATUSES)[number];

/** The AQL columns of the standard's tables, as the planning form offers them. */
export const AQL_CHOICES = AQLS;

/** Longest period a round may cover: a lot is a batch of work, not a shop's whole history. */
export const MAX_PERIOD_DAYS = 366;

/**
 * What is wrong with a round's period of two valid local dates (it ends before it starts, or is
 * longer than a round may be); null when it is fine.
 */
export function roundPeriodError(from: string, to: string): string | null {
  const a = Date.parse(`${from}T00:00:00Z`) / 86_400_000;
  const b = Date.parse(`${to}T00:00:00Z`) / 86_400_000;
  if (Number.isNaN(a) || Number.isNaN(b)) return null;
  if (b < a) return 'The period must end on or after its start';
  if (b - a + 1 > MAX_PERIOD_DAYS) return `A round covers at most ${MAX_PERIOD_DAYS} days`;
  return null;
}

export type CorrectiveActionMover = 'shop_lead' | 'verifier';

/**
 * The status changes a role may make: the shop lead moves an action along (open → in progress →
 * done); a regional manager or the owner verifies a done action, or sends it back to in progress.
 */
export function correctiveActionMoves(
  mover: CorrectiveActionMover | null,
  status: CorrectiveActionStatusValue,
): CorrectiveActionStatusValue[] {
  if (mover === 'shop_lead') {
    if (status === 'open') return ['in_progress', 'done'];
    if (status === 'in_progress') return ['done'];
  }
  if (mover === 'verifier' && status === 'done') return ['verified', 'in_progress'];
  return [];
}
