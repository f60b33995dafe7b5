import type { SeverityValue } from '~/lib/audits';
import type { TurnaroundUnit } from '~/lib/network';
import type {
  ComebackFigures,
  NetworkComparisonResult,
  ShopFigures,
} from '~/server/queries/network';
import {
  BAND_LABELS,
  bandExplanation,
  formatCount,
  formatDuration,
  formatInterval,
  formatMoney,
  formatPercent,
} from './format';

// Plain-language explanations of each figure, shown on hover and focus wherever it appears.

export function turnaroundText(
  f: ShopFigures,
  which: 'customer' | 'bench',
  q: 'median' | 'p90',
  unit: TurnaroundUnit,
) {
  const t = which === 'customer' ? f.customerTurnaround : f.benchTurnaround;
  if (t.count === 0) return 'No job became ready in this period.';
  const value = formatDuration(t[q], unit, f.shop.openMinutesPerDay);
  const what =
    which === 'customer'
      ? 'from check-in to ready'
      : 'from check-in to ready, not counting time waiting on parts';
  const share = q === 'median' ? 'Half' : '9 in 10';
  const day =
    unit === 'days' && f.shop.openMinutesPerDay
      ? ` A business day here is the shop's average open day of ${(f.shop.openMinutesPerDay / 60).toFixed(1)} hours.`
      : '';
  return `${share} of the ${formatCount(t.count)} jobs that became ready took at most ${value} of opening hours ${what}.${day}`;
}

export const jobsReadyText = (f: ShopFigures) =>
  `${formatCount(f.jobsReady)} jobs became ready for pickup in this period, in the shop's own time zone.`;

export const onTimeText = ({ onTime: o }: ShopFigures) =>
  o.total === 0
    ? 'No job with a promised time became ready in this period.'
    : `${formatCount(o.onTime)} of ${formatCount(o.total)} jobs with a promised time were ready by it.`;

/** How many of the period's jobs are still being followed, in words. */
export function followedText(c: ComebackFigures, warrantyDays: number) {
  const e = c.estimate;
  if (e.stillFollowed === 0) return '';
  return `${formatCount(e.stillFollowed)} of its ${formatCount(e.jobs)} jobs are still inside their ${warrantyDays}-day window and still followed.`;
}

export function comebackText(f: ShopFigures, settings: NetworkComparisonResult['settings']) {
  const c = f.comebacks;
  const warranty = settings.warrantyDays;
  const counted = settings.countedAttributions.map((a) => a.replace('_', ' ')).join(' or ');
  const pending =
    c.awaitingReview > 0
      ? ` ${formatCount(c.awaitingReview)} more came back and await review, not counted yet.`
      : '';
  if (c.comparison === 'ratio') {
    const e = c.estimate;
    if (e.jobs === 0) return 'No job was collected in this period yet.';
    const how =
      e.method === 'kaplan-meier'
        ? `Estimated from each job's follow-up so far (Kaplan–Meier): the chance that a job comes back for ${counted} within ${warranty} days, 95% interval ${formatInterval(c.interval)}.`
        : e.method === 'network × ratio'
          ? `No job of this period has been followed for all ${warranty} days yet, so the estimate is the network's ${warranty}-day rate times this shop's observed ÷ expected comebacks, 95% interval ${formatInterval(c.interval)}.`
          : 'There is no estimate yet.';
    return `Estimate, not final. ${formatCount(e.events)} of ${formatCount(e.jobs)} jobs came back for ${counted} so far. ${how} ${followedText(c, warranty)}${pending} A comeback joins the estimate once the day of follow-up it fell on is over (within 24 hours).`;
  }
  if (c.trials === 0)
    return `No collected job in this period has a closed ${warranty}-day warranty window yet, and none has come back.`;
  return `${formatCount(c.events)} of ${formatCount(c.trials)} jobs came back for ${counted}: every ${warranty}-day warranty window of the period has closed, so the rate is final. 95% Wilson interval ${formatInterval(c.interval)}.${pending}`;
}

/** Plain words for a comeback band: the final-rate funnel, or observed against expected. */
export function comebackBandText(c: ComebackFigures, networkRate: number | null) {
  if (c.comparison !== 'ratio') return bandExplanation('comebacks', c, networkRate);
  const r = c.ratio;
  if (!r || c.band === null) {
    return 'Nothing to compare yet: no network curve to measure this period against, or no job collected.';
  }
  const oe = `${formatCount(r.observed)} comeback${r.observed === 1 ? '' : 's'} so far against ${r.expected.toFixed(1)} expected from the network's curve over these jobs' own follow-up (O/E ${r.ratio === null ? '—' : r.ratio.toFixed(2)})`;
  if (r.note === 'too little follow-up' || r.note === 'nothing expected') {
    return `In line: ${oe}. Too little follow-up to judge yet.`;
  }
  if (r.note === 'within its own uncertainty') {
    return `In line: ${oe}. Outside a funnel line, but so few comebacks are within their own uncertainty.`;
  }
  if (c.band === 'in line') return `In line: ${oe}, within what chance alone gives.`;
  const odds = c.band === 'on watch' ? '1 time in 20' : '1 time in 500';
  return `${BAND_LABELS[c.band]}: ${oe}; a ratio this ${r.side === 'low' ? 'low' : 'high'} happens by chance less than ${odds}.`;
}

export const revenueText = ({ revenue: r }: ShopFigures) =>
  r.benchMinutes === 0
    ? 'No bench time was logged on the jobs that became ready, so there is no rate.'
    : `${formatMoney(r.revenueCents, true)} billed (labour + parts − discount) on the jobs that became ready, over ${(r.benchMinutes / 60).toFixed(1)} logged bench hours.`;

export const realisationText = (f: ShopFigures) =>
  f.revenue.realisation === null
    ? 'No bench time logged (or no posted rate), so no realisation.'
    : `Labour earned ${formatMoney(f.revenue.labourPerBenchHourCents)} per logged bench hour against the posted rate of ${formatMoney(f.shop.labourRateCents)} an hour.`;

export const auditText = ({ audits: a }: ShopFigures) =>
  a.rounds === 0
    ? 'No audit rounds yet for this period.'
    : `${formatCount(a.trials)} sampled jobs scored in ${formatCount(a.rounds)} audit round${a.rounds === 1 ? '' : 's'} ending in this period; ${formatCount(a.events)} failed (needs work or critical miss), ${formatCount(a.criticalMisses)} of them critical misses.${a.trials === 0 ? '' : ` Failure rate ${formatPercent(a.rate)}, 95% Wilson interval ${formatInterval(a.interval)}.`}${a.averageScore === null ? '' : ` Average score ${formatScore(a.averageScore)} of 100.`}${a.roundsAccepted + a.roundsRejected === 0 ? '' : ` Decided: ${roundsDecidedText(a)}.`} ${severityText(a.severity)}`;

/** Mean audit score out of 100, one decimal. */
export const formatScore = (score: number) =>
  score.toLocaleString('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 });

export const roundsDecidedText = (a: { roundsAccepted: number; roundsRejected: number }) => {
  const decided = a.roundsAccepted + a.roundsRejected;
  return `${formatCount(a.roundsRejected)} of ${formatCount(decided)} round${decided === 1 ? '' : 's'} rejected`;
};

const severityText = (severity: SeverityValue) =>
  ({
    normal: 'The next round is on normal inspection.',
    tightened:
      'The next round is on tightened inspection: two of the last five or fewer rounds were rejected, so samples are judged more strictly until five rounds in a row are accepted.',
    reduced:
      'The next round is on reduced inspection: a long run of accepted rounds earned a smaller sample.',
    discontinued:
      'Sampling is discontinued: five rounds were rejected on tightened inspection. No round is planned until the corrective actions are verified and the owner agrees how to resume.',
  })[severity];

export const actionsText = ({ correctiveActions: a }: ShopFigures) =>
  a.open === 0
    ? 'No corrective action is open at this shop now.'
    : `${formatCount(a.open)} corrective action${a.open === 1 ? ' is' : 's are'} open now; ${formatCount(a.overdue)} past the due date.`;

export const waitingText = (f: ShopFigures, unit: TurnaroundUnit) =>
  f.customerTurnaround.totalMinutes === 0
    ? 'No job became ready in this period.'
    : `Of all the opening time these jobs spent between check-in and ready, ${formatDuration(f.waitingPartsMinutes, unit, f.shop.openMinutesPerDay)} was spent waiting on parts.`;
