import {
  compareShops,
  rateRealisation,
  revenuePerBenchHour,
  type ComebackReference,
  type ShopComparison,
  type SurvivalTable,
} from '@reelwright/metrics';
import type { SeverityValue } from '~/lib/validators/audits';
import { comebackFigures, comebackTotals } from './comeback-figures';
import type { ShopCounts } from './comparison';
import { toRef, type NetworkShop } from './context';
import type { NetworkTotals, RateFigures, ShopFigures } from './types';

/** The follow-up tables of a period's shops and how they are compared. */
export interface ComebackTotalsInput {
  tables: ReadonlyMap<string, SurvivalTable>;
  options: { warrantyDays: number; final: boolean; reference: ComebackReference | null };
}

const EMPTY: Omit<ShopCounts, 'shopId'> = {
  jobsReady: 0,
  customerN: 0,
  customerTotal: 0,
  customerMedian: null,
  customerP90: null,
  benchN: 0,
  benchTotal: 0,
  benchMedian: null,
  benchP90: null,
  waitingMinutes: 0,
  promised: 0,
  onTime: 0,
  revenueCents: 0,
  labourCents: 0,
  benchMinutes: 0,
  collected: 0,
  trials: 0,
  events: 0,
  awaitingReview: 0,
  auditRounds: 0,
  auditScored: 0,
  auditFailures: 0,
  auditCritical: 0,
  auditScoreSum: 0,
  auditAccepted: 0,
  auditRejected: 0,
  actionsOpen: 0,
  actionsOverdue: 0,
};

function rateFigures(c: ShopComparison, networkRate: number | null): RateFigures {
  const side =
    c.rate === null || networkRate === null
      ? null
      : c.rate > networkRate
        ? 'above'
        : c.rate < networkRate
          ? 'below'
          : 'equal';
  return {
    events: c.events,
    trials: c.trials,
    rate: c.rate,
    interval: c.interval,
    funnel95: c.funnel95,
    funnel998: c.funnel998,
    band: c.trials === 0 ? null : c.band,
    side,
  };
}

/** Totals of a set of shops; the comeback totals come from their merged follow-up tables. */
export function totals(
  figures: readonly ShopFigures[],
  comebacks: ComebackTotalsInput,
): NetworkTotals {
  const sum = (pick: (f: ShopFigures) => number) => figures.reduce((t, f) => t + pick(f), 0);
  const auditEvents = sum((f) => f.audits.events);
  const auditTrials = sum((f) => f.audits.trials);
  const revenueCents = sum((f) => f.revenue.revenueCents);
  const benchMinutes = sum((f) => f.revenue.benchMinutes);
  return {
    shops: figures.length,
    jobsReady: sum((f) => f.jobsReady),
    comebacks: comebackTotals(
      figures.map((f) => f.shop.id),
      figures.map((f) => f.comebacks),
      comebacks.tables,
      comebacks.options,
    ),
    audits: {
      events: auditEvents,
      trials: auditTrials,
      rounds: sum((f) => f.audits.rounds),
      rate: auditTrials === 0 ? null : auditEvents / auditTrials,
    },
    revenue: {
      revenueCents,
      labourCents: sum((f) => f.revenue.labourCents),
      benchMinutes,
      perBenchHourCents: revenuePerBenchHour([{ revenueCents, benchMinutes }]),
    },
    correctiveActions: {
      open: sum((f) => f.correctiveActions.open),
      overdue: sum((f) => f.correctiveActions.overdue),
    },
  };
}

/**
 * Figures for every shop of the network from the aggregate, through @reelwright/metrics: the
 * comeback estimate and its comparison (`comebackFigures`: final rates against the pooled
 * network rate, or O/E against the network reference while windows are open), audit failure
 * rates against the network's pooled rate with Wilson intervals, funnel limits and bands, revenue
 * per bench hour and rate realisation.
 */
export function assembleFigures(
  shops: readonly NetworkShop[],
  counts: ReadonlyMap<number, ShopCounts>,
  severities: ReadonlyMap<number, { severity: SeverityValue }> = new Map(),
  comebackInput: ComebackTotalsInput,
) {
  const all = shops.map((shop) => ({ shop, c: { ...EMPTY, ...counts.get(shop.id) } }));
  const comebacks = comebackFigures(
    all.map(({ shop, c }) => ({
      shopId: shop.id,
      collected: c.collected,
      trials: c.trials,
      events: c.events,
      awaitingReview: c.awaitingReview,
    })),
    comebackInput.tables,
    comebackInput.options,
  );
  const audits = compareShops(
    all.map(({ shop, c }) => ({
      shopId: String(shop.id),
      events: c.auditFailures,
      trials: c.auditScored,
    })),
  );
  const figures = all.map(({ shop, c }, i): ShopFigures => {
    const realisation = rateRealisation(
      [{ labourCents: c.labourCents, benchMinutes: c.benchMinutes }],
      shop.labourRateCents,
    );
    return {
      shop: toRef(shop),
      jobsReady: c.jobsReady,
      customerTurnaround: {
        count: c.customerN,
        totalMinutes: c.customerTotal,
        median: c.customerMedian,
        p90: c.customerP90,
      },
      benchTurnaround: {
        count: c.benchN,
        totalMinutes: c.benchTotal,
        median: c.benchMedian,
        p90: c.benchP90,
      },
      waitingPartsMinutes: c.waitingMinutes,
      onTime: {
        onTime: c.onTime,
        total: c.promised,
        share: c.promised === 0 ? null : c.onTime / c.promised,
      },
      comebacks: comebacks[i]!,
      revenue: {
        revenueCents: c.revenueCents,
        labourCents: c.labourCents,
        benchMinutes: c.benchMinutes,
        perBenchHourCents: revenuePerBenchHour([
          { revenueCents: c.revenueCents, benchMinutes: c.benchMinutes },
        ]),
        labourPerBenchHourCents: realisation.labourPerBenchHour,
        realisation: realisation.realisation,
      },
      audits: {
        ...rateFigures(audits.shops[i]!, audits.networkRate),
        rounds: c.auditRounds,
        criticalMisses: c.auditCritical,
        averageScore: c.auditScored === 0 ? null : c.auditScoreSum / c.auditScored,
        roundsAccepted: c.auditAccepted,
        roundsRejected: c.auditRejected,
        severity: severities.get(shop.id)?.severity ?? 'normal',
      },
      correctiveActions: { open: c.actionsOpen, overdue: c.actionsOverdue },
    };
  });
  return { figures, network: totals(figures, comebackInput) };
}
