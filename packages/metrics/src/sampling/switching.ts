import { AQLS, type Severity } from './tables';
import { aqlColumn, tablePlan } from './plan';

export type LotOutcome = 'accepted' | 'rejected';
export type NextSeverity = Severity | 'discontinued';

/**
 * What the switching rules need to know about one inspected lot: its count of nonconforming
 * items in the sample, the AQL and the code letter of the plan it was inspected with (either
 * the letter from Table I or the one `singleSamplingPlan` returns: arrows are followed).
 */
export interface InspectedLot {
  nonconforming: number;
  aql: number;
  codeLetter: string;
}

/** Acceptance number of the same sample size one AQL step tighter (ISO 2859-1:1999 §9.3.3.2). */
function tighterAccept(codeLetter: string, aql: number): number | null {
  const plan = tablePlan('normal', codeLetter, aql);
  const j = aqlColumn(aql);
  if (j === 0) return null;
  const tighter = tablePlan('normal', plan.codeLetter, AQLS[j - 1]!);
  return tighter.codeLetter === plan.codeLetter ? tighter.accept : null;
}

/**
 * Inspection severity for the next lot under the switching rules of ISO 2859-1:1999 §9.3 and
 * §9.4 (MIL-STD-105E §4.7 has the same rules except the switching score), replaying
 * `recentLots` (outcomes on original inspection since the current severity began, oldest
 * first) one lot at a time, so a switch part-way through is followed by the later lots:
 *
 * - normal → tightened when 2 of 5 or fewer consecutive lots are rejected (§9.3.1);
 * - tightened → normal after 5 consecutive accepted lots (§9.3.2);
 * - normal → reduced when at least 10 consecutive lots are accepted and the switching score
 *   reaches 30 (§9.3.3): the score starts at 0 on normal inspection; for a plan with Ac ≥ 2
 *   add 3 if the lot would have been accepted one AQL step tighter, else reset to 0; for
 *   Ac 0 or 1 add 2 if the lot is accepted, else reset to 0. The score needs each lot's
 *   nonconforming count (`lots`, aligned with `recentLots`); without it normal stays normal.
 *   Steady production and the responsible authority's consent, also required, are the
 *   caller's call;
 * - reduced → normal on a rejected lot (§9.3.4), or (with `lots`) a lot accepted with more
 *   nonconforming items than Table II-C's acceptance number (MIL-STD-105E, reduced
 *   inspection: "lot acceptable, but normal inspection reinstated");
 * - discontinued when the lots rejected on tightened inspection reach 5 (§9.4); it stays so.
 *
 * Throws RangeError when `lots` is given with a different length from `recentLots`.
 */
export function nextSeverity(
  current: Severity,
  recentLots: ReadonlyArray<LotOutcome>,
  lots?: ReadonlyArray<InspectedLot>,
): NextSeverity {
  if (lots && lots.length !== recentLots.length) {
    throw new RangeError('lots must describe the same lots as recentLots');
  }
  let state: NextSeverity = current;
  let window: LotOutcome[] = [];
  let consecutiveAccepted = 0;
  let score = 0;
  let rejectedOnTightened = 0;
  const enter = (next: NextSeverity): void => {
    state = next;
    window = [];
    consecutiveAccepted = 0;
    score = 0;
    rejectedOnTightened = 0;
  };

  for (let i = 0; i < recentLots.length; i++) {
    const outcome = recentLots[i]!;
    const lot = lots?.[i];
    const accepted = outcome === 'accepted';
    consecutiveAccepted = accepted ? consecutiveAccepted + 1 : 0;
    if (state === 'normal') {
      window.push(outcome);
      if (window.length > 5) window.shift();
      if (window.filter((o) => o === 'rejected').length >= 2) {
        enter('tightened');
        continue;
      }
      if (!lots || !lot) continue;
      const plan = tablePlan('normal', lot.codeLetter, lot.aql);
      if (plan.accept >= 2) {
        const tighter = tighterAccept(lot.codeLetter, lot.aql);
        score = accepted && tighter !== null && lot.nonconforming <= tighter ? score + 3 : 0;
      } else {
        score = accepted ? score + 2 : 0;
      }
      if (score >= 30 && consecutiveAccepted >= 10) enter('reduced');
    } else if (state === 'tightened') {
      if (!accepted) {
        rejectedOnTightened++;
        if (rejectedOnTightened >= 5) {
          enter('discontinued');
          break;
        }
      }
      if (consecutiveAccepted >= 5) enter('normal');
    } else if (state === 'reduced') {
      const plan = lot ? tablePlan('reduced', lot.codeLetter, lot.aql) : null;
      if (!accepted || (plan && lot && lot.nonconforming > plan.accept)) enter('normal');
    }
  }
  return state;
}
