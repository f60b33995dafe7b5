export type AuditAnswer = 'pass' | 'fail' | 'n/a';
export type AuditVerdict = 'meets standard' | 'needs work' | 'critical miss';

export interface AuditItem {
  id: string;
  weight: number;
  critical: boolean;
}

export interface AuditScore {
  score: number;
  verdict: AuditVerdict;
  /** Ids of failed critical items. */
  criticalFailures: string[];
  /** Ids of items with no answer; they are left out of the score like "n/a". */
  unanswered: string[];
}

/**
 * Audit score (README, figures table): 100 × Σ weight of passed items / Σ weight of
 * applicable items (answered pass or fail). Any failed critical item makes the verdict
 * "critical miss" whatever the score; otherwise score ≥ passMark (default 85) "meets
 * standard", below it "needs work".
 *
 * With no applicable weight (no items, all "n/a" or zero weights) the score is 100: nothing
 * applicable failed. Unanswered items count as not applicable and are listed. Throws
 * RangeError on a negative or non-finite weight or a passMark outside [0, 100].
 */
export function scoreAudit(
  items: ReadonlyArray<AuditItem>,
  answers: Readonly<Record<string, AuditAnswer>>,
  passMark = 85,
): AuditScore {
  if (!(passMark >= 0 && passMark <= 100)) {
    throw new RangeError(`passMark must be in [0, 100], got ${passMark}`);
  }
  let applicable = 0;
  let passed = 0;
  const criticalFailures: string[] = [];
  const unanswered: string[] = [];
  for (const item of items) {
    if (!(item.weight >= 0 && Number.isFinite(item.weight))) {
      throw new RangeError(`item ${item.id}: weight must be a non-negative number`);
    }
    const answer = Object.hasOwn(answers, item.id) ? answers[item.id] : undefined;
    if (answer === undefined) {
      unanswered.push(item.id);
      continue;
    }
    if (answer === 'n/a') continue;
    applicable += item.weight;
    if (answer === 'pass') passed += item.weight;
    else if (item.critical) criticalFailures.push(item.id);
  }
  const score = applicable === 0 ? 100 : (100 * passed) / applicable;
  const verdict: AuditVerdict =
    criticalFailures.length > 0
      ? 'critical miss'
      : score >= passMark
        ? 'meets standard'
        : 'needs work';
  return { score, verdict, criticalFailures, unanswered };
}
