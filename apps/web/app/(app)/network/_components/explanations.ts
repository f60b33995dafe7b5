import type { SeverityValue } from '~/lib/validators/audits';
import type { TurnaroundUnit } from '~/lib/validators/network';
import type { NetworkComparisonResult, ShopFigures } from '~/server/queries/network';
import { formatCount, formatDuration, formatInterval, formatMoney, formatPercent } from './format';

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

export function comebackText(f: ShopFigures, settings: NetworkComparisonResult['settings']) {
  const c = f.comebacks;
  const warranty = settings.warrantyDays;
  const counted = settings.countedAttributions.map((a) => a.replace('_', ' ')).join(' or ');
  if (c.trials === 0)
    return `No collected job in this period has a closed ${warranty}-day warranty window yet, and none has come back.`;
  const left =
    c.censored > 0 ? `; ${formatCount(c.censored)} still inside their window are left out` : '';
  const pending =
    c.awaitingReview > 0
      ? ` ${formatCount(c.awaitingReview)} more came back and await review, not counted yet.`
      : '';
  return `${formatCount(c.events)} of ${formatCount(c.trials)} jobs came back for ${counted}. Counted: jobs collected in the period whose ${warranty}-day warranty window has closed, plus those that already came back${left}. 95% Wilson interval ${formatInterval(c.interval)}.${pending}`;
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
