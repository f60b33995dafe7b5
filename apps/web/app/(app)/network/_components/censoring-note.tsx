import { formatCount } from './format';
import { addDays, formatDay } from './periods';

/**
 * Says plainly when the comeback rate is not final: jobs still inside their warranty window are
 * left out until it closes, while those that already came back are counted, so a recent period
 * reads high. Nothing is shown once every window has closed.
 */
export function CensoringNote(props: {
  collected: number;
  censored: number;
  warrantyDays: number;
  to: string;
}) {
  if (props.censored === 0) return null;
  const share = props.collected > 0 ? props.censored / props.collected : 0;
  const finalBy = addDays(props.to, props.warrantyDays + 1);
  return (
    <p
      role="note"
      className={`mb-6 rounded-md border px-4 py-3 ${share >= 0.1 ? 'border-amber-300 bg-amber-50 text-amber-950' : 'border-sand-200 bg-white text-slate-700'}`}
    >
      <strong className="font-semibold">Comeback figures are not final yet.</strong>{' '}
      {formatCount(props.censored)} of the {formatCount(props.collected)} jobs collected in this
      period are still inside their {props.warrantyDays}-day warranty window and are left out until
      it closes; those that already came back are counted, so the rate reads high for now. Every
      window closes by {formatDay(finalBy)}.
    </p>
  );
}
