import type { FairnessBand } from '@reelwright/metrics';
import { BAND_LABELS } from './format';

// Slate, amber and brick red, each with its own mark and always its words (never colour alone).
const STYLES: Record<FairnessBand, { box: string; mark: string }> = {
  'in line': { box: 'bg-slate-100 text-slate-800 ring-slate-300', mark: '●' },
  'on watch': { box: 'bg-amber-50 text-amber-900 ring-amber-400', mark: '▲' },
  'out of line': { box: 'bg-brick-50 text-brick-800 ring-brick-300', mark: '◆' },
};

export function BandBadge(props: {
  band: FairnessBand | null;
  side?: 'above' | 'below' | 'equal' | null;
}) {
  if (props.band === null) {
    return <span className="text-sm whitespace-nowrap text-slate-600">No band</span>;
  }
  const style = STYLES[props.band];
  const side =
    props.band !== 'in line' && (props.side === 'above' || props.side === 'below')
      ? ` · ${props.side === 'above' ? 'high' : 'low'}`
      : '';
  return (
    <span
      className={`inline-flex items-center gap-1 rounded-full px-2 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset ${style.box}`}
    >
      <span aria-hidden="true" className="text-xs">
        {style.mark}
      </span>
      {BAND_LABELS[props.band]}
      {side}
    </span>
  );
}

export const BAND_COLOURS: Record<FairnessBand, string> = {
  'in line': '#475569',
  'on watch': '#d97706',
  'out of line': '#a03c28',
};
