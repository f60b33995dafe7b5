import type { ComebackFigures, NetworkComparisonResult } from '~/server/queries/network';
import { formatCount, formatPercent } from './format';
import { addDays, formatDay } from './periods';

/**
 * Says in words which comparison the comeback figures show: final rates on the binomial funnel
 * once every warranty window of the period has closed, or, while windows are open, estimates
 * from each job's follow-up so far, compared as observed against expected comebacks; with how
 * many jobs are still being followed and when the figures become final.
 */
export function CensoringNote(props: {
  comebacks: Pick<ComebackFigures, 'comparison' | 'estimate'>;
  reference: NetworkComparisonResult['reference'];
  warrantyDays: number;
  to: string;
}) {
  const c = props.comebacks;
  if (c.comparison === 'binomial') return null;
  const e = c.estimate;
  const finalBy = addDays(props.to, props.warrantyDays + 1);
  const reference = props.reference
    ? ` the network's own curve over ${formatDay(props.reference.from)} – ${formatDay(props.reference.to)} (${formatCount(props.reference.jobs)} jobs, ${formatPercent(props.reference.probability)} back within ${props.warrantyDays} days)`
    : ' a network curve, which this period does not have yet (no earlier job followed through the window), so no shop is judged';
  return (
    <p
      role="note"
      className="mb-6 rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-amber-950"
    >
      <strong className="font-semibold">Comeback figures are estimates, not final yet.</strong>{' '}
      {formatCount(e.stillFollowed)} of the {formatCount(e.jobs)} jobs collected in this period are
      still inside their {props.warrantyDays}-day warranty window and still followed. Each rate is
      estimated from every job&apos;s follow-up so far (Kaplan–Meier), and shops are compared by the
      comebacks they had against those expected from{reference}: observed ÷ expected on a funnel of
      its own, not the final-rate funnel. Every window closes by {formatDay(finalBy)}.
    </p>
  );
}
