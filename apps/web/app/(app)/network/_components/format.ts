import type { FairnessBand, Interval } from '@reelwright/metrics';
import type { TurnaroundUnit } from '~/lib/network';
import type { RateFigures } from '~/server/queries/network';

export const DASH = '—';

export function formatPercent(x: number | null | undefined, digits = 1) {
  if (x == null || !Number.isFinite(x)) return DASH;
  return `${(x * 100).toFixed(digits)}%`;
}

export function formatInterval(i: Interval | null | undefined, digits = 1) {
  if (!i) return DASH;
  return `${(i.lower * 100).toFixed(digits)}–${(i.upper * 100).toFixed(digits)}%`;
}

const money = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
const wholeMoney = new Intl.NumberFormat('en-US', {
  style: 'currency',
  currency: 'USD',
  maximumFractionDigits: 0,
});

export function formatMoney(cents: number | null | undefined, whole = false) {
  if (cents == null || !Number.isFinite(cents)) return DASH;
  return (whole ? wholeMoney : money).format(cents / 100);
}

const count = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });
export const formatCount = (n: number) => count.format(n);

/** Business minutes in the chosen unit: hours, or days of the shop's average open day. */
export function inUnit(minutes: number, unit: TurnaroundUnit, openMinutesPerDay: number | null) {
  if (unit === 'days' && openMinutesPerDay) return minutes / openMinutesPerDay;
  return minutes / 60;
}

export const unitSuffix = (unit: TurnaroundUnit) => (unit === 'days' ? 'd' : 'h');
export const unitWord = (unit: TurnaroundUnit) =>
  unit === 'days' ? 'business days' : 'business hours';

export function formatDuration(
  minutes: number | null | undefined,
  unit: TurnaroundUnit,
  openMinutesPerDay: number | null,
) {
  if (minutes == null || !Number.isFinite(minutes)) return DASH;
  return `${inUnit(minutes, unit, openMinutesPerDay).toFixed(1)} ${unitSuffix(unit)}`;
}

export const BAND_LABELS: Record<FairnessBand, string> = {
  'in line': 'In line',
  'on watch': 'On watch',
  'out of line': 'Out of line',
};

/** Plain words for a band: what the funnel limits say about a rate at this volume. */
export function bandExplanation(what: string, f: RateFigures, networkRate: number | null) {
  if (f.band === null || f.rate === null) {
    return `No ${what} to judge in this period, so no band.`;
  }
  const direction = f.side === 'below' ? 'low' : 'high';
  const against = `the network's ${formatPercent(networkRate)}`;
  const volume = `for a shop of this volume (${formatCount(f.trials)} counted)`;
  if (f.band === 'in line') {
    return `In line: ${volume}, a rate of ${formatPercent(f.rate)} is within what chance alone gives around ${against} (95% limits ${formatInterval(f.funnel95)}).`;
  }
  const odds = f.band === 'on watch' ? '1 time in 20' : '1 time in 500';
  const limits =
    f.band === 'on watch'
      ? `outside the 95% limits ${formatInterval(f.funnel95)}`
      : `outside the 99.8% limits ${formatInterval(f.funnel998)}`;
  const note = f.side === 'below' ? ' Lower than the network: worth learning from.' : '';
  return `${BAND_LABELS[f.band]}: ${volume}, a rate this ${direction} happens by chance less than ${odds} around ${against} (${limits}).${note}`;
}
