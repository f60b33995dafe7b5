import {
  billedRevenueCents,
  comebackEstimate,
  comebackRate,
  followUpTable,
  mergeSurvivalTables,
  type ComebackReference,
  type SurvivalTable,
  onTimeShare,
  revenuePerBenchHour,
  royaltyCents,
  turnaroundSummary,
  wilsonInterval,
  type ComebackAttribution,
} from '@reelwright/metrics';

export interface Turnaround {
  count: number;
  /** Business minutes (Hyndman & Fan type 7); null with no job. */
  medianMinutes: number | null;
  p90Minutes: number | null;
}

export interface Rate {
  events: number;
  trials: number;
  rate: number | null;
  /** 95% Wilson score interval; null with no trial. */
  lower: number | null;
  upper: number | null;
}

/** The month-close figures of one shop (or, with `shop` null, of a set of shops). */
export interface Figures {
  jobs: { checkedIn: number; ready: number; collected: number };
  /** Jobs collected in the month: what was billed, and what royalties are due on. */
  money: { labourCents: number; partsCents: number; discountCents: number; billedCents: number };
  /** Logged bench minutes of the jobs collected in the month. */
  benchMinutes: number;
  /** Billed revenue per logged bench hour, whole cents; null with no bench time. */
  revenuePerBenchHourCents: number | null;
  /** Jobs that became ready in the month. */
  customerTurnaround: Turnaround;
  benchTurnaround: Turnaround;
  onTime: { onTime: number; total: number; share: number | null };
  /** Jobs collected in the month, their warranty window closed (or come back) by `asOf`. */
  comebacks: Rate;
  /**
   * The comeback estimate from each collected job's follow-up (Kaplan–Meier, or the network
   * curve carried by O/E while no job has been followed through the window), with observed and
   * expected comebacks against the network reference. Absent from months frozen before it.
   */
  comebackEstimate?: MonthEstimate;
  /** Audit rounds decided in the month. */
  audits: { rounds: number; rejected: number; failures: number };
  /** Corrective actions open at the end of the month. */
  openCorrectiveActions: number;
  /** Null on a totals row (each shop has its own rate). */
  royaltyRateBp: number | null;
  royaltyCents: number;
}

export interface MonthEstimate {
  probability: number | null;
  lower: number | null;
  upper: number | null;
  observed: number;
  /** Null without a network reference. */
  expected: number | null;
  ratio: number | null;
  stillFollowed: number;
  /** Every window closed or ended by a comeback: the final-rate columns apply. */
  final: boolean;
  /** The follow-up table, so that totals can pool it. */
  table: SurvivalTable;
}

export interface ShopRef {
  id: number;
  name: string;
  regionId: number;
  regionName: string;
  timeZone: string;
  royaltyRateBp: number;
}

export interface ShopFigures extends Figures {
  shop: ShopRef;
  /** Local dates of the month in the shop's zone, inclusive. */
  periodStart: string;
  periodEnd: string;
}

export interface TotalsFigures extends Figures {
  /** "All shops" or the region's name. */
  label: string;
  shops: number;
}

/** A job row as read for the month, with which of the month's events it took part in. */
export interface MonthJob {
  id: number;
  checkedInInMonth: boolean;
  readyInMonth: boolean;
  collectedInMonth: boolean;
  promisedAt: Date | null;
  readyAt: Date | null;
  collectedAt: Date | null;
  labourCents: number;
  partsCents: number;
  discountCents: number;
  benchMinutes: number | null;
  customerTurnaroundMinutes: number | null;
  benchTurnaroundMinutes: number | null;
}

export interface MonthComeback {
  originalJobId: number;
  /** Null while unreviewed: it came back, but counts only if "undetermined" does. */
  attribution: ComebackAttribution | null;
  detectedAt: Date;
}

export interface RateSettings {
  asOf: Date;
  warrantyDays: number;
  countedAttributions: readonly ComebackAttribution[];
  /** The network curve for O/E (the months before); null or absent: no expected comebacks. */
  reference?: ComebackReference | null;
}

/** The estimate of a follow-up table, against the reference when there is one. */
export function monthEstimate(table: SurvivalTable, settings: RateSettings): MonthEstimate {
  const e = comebackEstimate(table, {
    warrantyDays: settings.warrantyDays,
    reference: settings.reference ?? null,
  });
  return {
    probability: e.probability,
    lower: e.interval?.lower ?? null,
    upper: e.interval?.upper ?? null,
    observed: e.events,
    expected: e.ratio?.expected ?? null,
    ratio: e.ratio?.ratio ?? null,
    stillFollowed: e.stillFollowed,
    final: e.final,
    table,
  };
}

function summary(minutes: number[]): Turnaround {
  const s = turnaroundSummary(minutes);
  return { count: s.count, medianMinutes: s.median, p90Minutes: s.p90 };
}

export function rate(events: number, trials: number): Rate {
  const interval = wilsonInterval(events, trials);
  return {
    events,
    trials,
    rate: trials ? events / trials : null,
    lower: interval?.lower ?? null,
    upper: interval?.upper ?? null,
  };
}

const perHour = (revenueCents: number, benchMinutes: number) => {
  const value = revenuePerBenchHour([{ revenueCents, benchMinutes }]);
  return value === null ? null : Math.round(value);
};

/** One shop's figures from its rows of the month, through @reelwright/metrics. */
export function shopFigures(input: {
  jobs: readonly MonthJob[];
  comebacks: readonly MonthComeback[];
  audits: Figures['audits'];
  openCorrectiveActions: number;
  royaltyRateBp: number;
  settings: RateSettings;
}): Figures {
  const collected = input.jobs.filter((j) => j.collectedInMonth);
  const ready = input.jobs.filter((j) => j.readyInMonth);
  const money = { labourCents: 0, partsCents: 0, discountCents: 0, billedCents: 0 };
  let benchMinutes = 0;
  for (const job of collected) {
    money.labourCents += job.labourCents;
    money.partsCents += job.partsCents;
    money.discountCents += job.discountCents;
    money.billedCents += billedRevenueCents(job);
    benchMinutes += job.benchMinutes ?? 0;
  }
  const byJob = new Map<number, { attribution: ComebackAttribution; reportedAt: Date }[]>();
  for (const c of input.comebacks) {
    const list = byJob.get(c.originalJobId) ?? [];
    list.push({ attribution: c.attribution ?? 'undetermined', reportedAt: c.detectedAt });
    byJob.set(c.originalJobId, list);
  }
  const comebacks = comebackRate(
    collected.map((j) => ({ collectedAt: j.collectedAt, comebacks: byJob.get(j.id) ?? [] })),
    input.settings,
  );
  // Each collected job's first counted return, by the same rule as the rate above.
  const counted = new Set<string>(input.settings.countedAttributions);
  const table = followUpTable(
    collected.map((j) => {
      const times = (byJob.get(j.id) ?? [])
        .filter((c) => counted.has(c.attribution))
        .map((c) => c.reportedAt.getTime());
      return {
        collectedAt: j.collectedAt!,
        comebackAt: times.length ? new Date(Math.min(...times)) : null,
      };
    }),
    { asOf: input.settings.asOf, warrantyDays: input.settings.warrantyDays },
  );
  const onTime = onTimeShare(ready);
  return {
    jobs: {
      checkedIn: input.jobs.filter((j) => j.checkedInInMonth).length,
      ready: ready.length,
      collected: collected.length,
    },
    money,
    benchMinutes,
    revenuePerBenchHourCents: perHour(money.billedCents, benchMinutes),
    customerTurnaround: summary(
      ready.flatMap((j) =>
        j.customerTurnaroundMinutes === null ? [] : [j.customerTurnaroundMinutes],
      ),
    ),
    benchTurnaround: summary(
      ready.flatMap((j) => (j.benchTurnaroundMinutes === null ? [] : [j.benchTurnaroundMinutes])),
    ),
    onTime,
    comebacks: rate(comebacks.events, comebacks.trials),
    comebackEstimate: monthEstimate(table, input.settings),
    audits: input.audits,
    openCorrectiveActions: input.openCorrectiveActions,
    royaltyRateBp: input.royaltyRateBp,
    royaltyCents: royaltyCents(money.billedCents, input.royaltyRateBp),
  };
}

export interface PooledTurnaround {
  customer: Turnaround;
  bench: Turnaround;
}

/**
 * Network or region totals, built row by row so an export never holds every shop: counts, money,
 * bench time, audits and actions are sums; rates are pooled (Σ events / Σ trials, with the Wilson
 * interval of the pooled counts); royalty due is the sum of the shops' rounded royalties, as
 * invoiced. Quantiles cannot be summed: they come pooled from the database (`finish`).
 */
export class TotalsAccumulator {
  private shops = 0;
  private readonly sum = {
    checkedIn: 0,
    ready: 0,
    collected: 0,
    labourCents: 0,
    partsCents: 0,
    discountCents: 0,
    billedCents: 0,
    benchMinutes: 0,
    onTime: 0,
    onTimeTotal: 0,
    events: 0,
    trials: 0,
    rounds: 0,
    rejected: 0,
    failures: 0,
    openCorrectiveActions: 0,
    royaltyCents: 0,
  };

  private readonly tables: SurvivalTable[] = [];
  private estimated = true;

  constructor(
    readonly label: string,
    private readonly settings?: RateSettings,
  ) {}

  add(f: Figures): void {
    const s = this.sum;
    this.shops += 1;
    s.checkedIn += f.jobs.checkedIn;
    s.ready += f.jobs.ready;
    s.collected += f.jobs.collected;
    s.labourCents += f.money.labourCents;
    s.partsCents += f.money.partsCents;
    s.discountCents += f.money.discountCents;
    s.billedCents += f.money.billedCents;
    s.benchMinutes += f.benchMinutes;
    s.onTime += f.onTime.onTime;
    s.onTimeTotal += f.onTime.total;
    s.events += f.comebacks.events;
    s.trials += f.comebacks.trials;
    s.rounds += f.audits.rounds;
    s.rejected += f.audits.rejected;
    s.failures += f.audits.failures;
    s.openCorrectiveActions += f.openCorrectiveActions;
    s.royaltyCents += f.royaltyCents;
    if (f.comebackEstimate) this.tables.push(f.comebackEstimate.table);
    else this.estimated = false;
  }

  finish(pooled: PooledTurnaround): TotalsFigures {
    const s = this.sum;
    return {
      label: this.label,
      shops: this.shops,
      jobs: { checkedIn: s.checkedIn, ready: s.ready, collected: s.collected },
      money: {
        labourCents: s.labourCents,
        partsCents: s.partsCents,
        discountCents: s.discountCents,
        billedCents: s.billedCents,
      },
      benchMinutes: s.benchMinutes,
      revenuePerBenchHourCents: perHour(s.billedCents, s.benchMinutes),
      customerTurnaround: pooled.customer,
      benchTurnaround: pooled.bench,
      onTime: {
        onTime: s.onTime,
        total: s.onTimeTotal,
        share: s.onTimeTotal ? s.onTime / s.onTimeTotal : null,
      },
      comebacks: rate(s.events, s.trials),
      ...(this.settings && this.estimated
        ? { comebackEstimate: monthEstimate(mergeSurvivalTables(this.tables), this.settings) }
        : {}),
      audits: { rounds: s.rounds, rejected: s.rejected, failures: s.failures },
      openCorrectiveActions: s.openCorrectiveActions,
      royaltyRateBp: null,
      royaltyCents: s.royaltyCents,
    };
  }
}
