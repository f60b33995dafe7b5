import type {
  ComebackAttribution,
  FairnessBand,
  Interval,
  PChartRow,
  RatioNote,
} from '@reelwright/metrics';
import type { SeverityValue } from '~/lib/validators/audits';

// Plain JSON shapes: the API returns them and the server pages hand them to client components.

export interface PeriodInfo {
  /** Local dates, inclusive, read in each shop's own time zone. */
  from: string;
  to: string;
  /** The instant the figures were computed at (ISO); warranty windows close relative to it. */
  asOf: string;
}

export interface ShopRef {
  id: number;
  name: string;
  slug: string;
  region: { id: number; name: string };
  timeZone: string;
  /** Posted labour rate, cents per hour. */
  labourRateCents: number;
  /** Average open minutes of an open day (business days = business minutes ÷ this). */
  openMinutesPerDay: number | null;
  /** The local fishing season, "MM-DD". */
  seasonStart: string;
  seasonEnd: string;
}

export interface TurnaroundFigures {
  /** Jobs with a stored turnaround (the quantiles are over these). */
  count: number;
  /** Sum of the stored minutes, so a mean can be recomputed. */
  totalMinutes: number;
  /** Hyndman & Fan type 7 quantiles of business minutes; null with no jobs. */
  median: number | null;
  p90: number | null;
}

export interface RateFigures {
  events: number;
  trials: number;
  rate: number | null;
  /** Wilson 95% score interval; null with no trials. */
  interval: Interval | null;
  /** Funnel limits for this volume around the network rate. */
  funnel95: Interval;
  funnel998: Interval;
  /** Null with no trials (nothing to judge). */
  band: FairnessBand | null;
  /** Which side of the network rate the shop's rate falls; null with no trials or no network rate. */
  side: 'above' | 'below' | 'equal' | null;
}

/**
 * The estimated probability of a counted comeback within the warranty window, from the follow-up
 * of the period's collected jobs (Kaplan–Meier), or, when none has been followed through the
 * window yet, the network's probability times the shop's standardized ratio.
 */
export interface ComebackEstimateFigures {
  method: 'kaplan-meier' | 'network × ratio' | null;
  probability: number | null;
  /** 95%: log–log Kaplan–Meier interval, or the ratio's exact interval times the network's probability. */
  interval: Interval | null;
  /** Every job's window closed or ended by a comeback: the estimate is the final rate. */
  final: boolean;
  /** Jobs collected in the period by the as-of instant. */
  jobs: number;
  /** Counted comebacks so far. */
  events: number;
  /** Jobs still inside their window without a counted comeback. */
  stillFollowed: number;
  /** Jobs followed through the whole window (or back on its last day). */
  followedThrough: number;
}

/** Observed against expected comebacks (O/E) on Spiegelhalter's Poisson funnel. */
export interface RatioFigures {
  observed: number;
  /** Σ of the network reference's cumulative hazard at each job's own follow-up time. */
  expected: number;
  ratio: number | null;
  /** Exact Poisson (Garwood) 95% interval of O, over E. */
  interval: Interval | null;
  funnel95: Interval | null;
  funnel998: Interval | null;
  band: FairnessBand;
  side: 'high' | 'low' | null;
  /** Why a ratio outside a funnel line is still in line, or cannot be judged. */
  note: RatioNote | null;
}

/**
 * Which comparison the bands come from: 'binomial' (final rates on the funnel around the network
 * rate, every window closed) or 'ratio' (O/E on the Poisson funnel, windows still open).
 */
export type ComebackComparison = 'binomial' | 'ratio';

export interface ComebackFigures extends RateFigures {
  /** Jobs collected in the period. */
  collected: number;
  /** Collected jobs still inside their warranty window that have not come back. */
  censored: number;
  /** Comebacks against jobs of the period still awaiting review (not counted yet). */
  awaitingReview: number;
  comparison: ComebackComparison;
  estimate: ComebackEstimateFigures;
  /** O/E against the network reference; null for a final period (or with no reference). */
  ratio: RatioFigures | null;
}

export interface AuditFigures extends RateFigures {
  /** Audit rounds whose period ends inside the period (cancelled rounds left out). */
  rounds: number;
  criticalMisses: number;
  /** Mean score (0–100) of the scored samples; null with none. */
  averageScore: number | null;
  /** Decided rounds of the period by their decision. */
  roundsAccepted: number;
  roundsRejected: number;
  /**
   * The inspection severity the shop's next round will use, from its whole history of rounds
   * (ISO 2859-1 switching rules): a standing, not a figure of the period.
   */
  severity: SeverityValue;
}

export interface RevenueFigures {
  /** Jobs that became ready in the period: labour + parts − discount. */
  revenueCents: number;
  labourCents: number;
  benchMinutes: number;
  /** Billed revenue per logged bench hour, cents; null with no bench time. */
  perBenchHourCents: number | null;
  labourPerBenchHourCents: number | null;
  /** Labour per bench hour ÷ posted rate; null without bench time or a posted rate. */
  realisation: number | null;
}

export interface ShopFigures {
  shop: ShopRef;
  /** Jobs that became ready in the period. */
  jobsReady: number;
  customerTurnaround: TurnaroundFigures;
  benchTurnaround: TurnaroundFigures;
  waitingPartsMinutes: number;
  onTime: { onTime: number; total: number; share: number | null };
  comebacks: ComebackFigures;
  revenue: RevenueFigures;
  audits: AuditFigures;
  correctiveActions: { open: number; overdue: number };
}

export interface NetworkTotals {
  shops: number;
  jobsReady: number;
  comebacks: {
    events: number;
    trials: number;
    collected: number;
    censored: number;
    /** The estimate's probability (the final rate once every window has closed). */
    rate: number | null;
    comparison: ComebackComparison;
    estimate: ComebackEstimateFigures;
    /** O/E of these shops together (null for a final period). */
    ratio: {
      observed: number;
      expected: number;
      ratio: number | null;
      interval: Interval | null;
    } | null;
  };
  audits: { events: number; trials: number; rounds: number; rate: number | null };
  revenue: {
    revenueCents: number;
    labourCents: number;
    benchMinutes: number;
    perBenchHourCents: number | null;
  };
  correctiveActions: { open: number; overdue: number };
}

export interface NetworkComparisonResult {
  period: PeriodInfo;
  settings: {
    warrantyDays: number;
    countedAttributions: ComebackAttribution[];
    referenceMonths: number;
  };
  /**
   * The network curve O/E is measured against: every shop's jobs of the reference period (local
   * dates), its W-day probability; null for a final period, or when none was followed through.
   */
  reference: { from: string; to: string; jobs: number; probability: number } | null;
  /** The region filter applied, if any. */
  region: { id: number; name: string } | null;
  /** Regions the caller may filter by. */
  regions: { id: number; name: string }[];
  /** Every shop of the network: the rate each shop is compared with. */
  network: NetworkTotals;
  /** The shops in the response (the caller's scope, narrowed by the region filter). */
  view: NetworkTotals;
  shops: ShopFigures[];
}

/**
 * One month of a shop's comeback trend: its jobs collected that month (`trials`), their counted
 * comebacks so far (`events`) and the estimated probability of a counted comeback within the
 * warranty window (`rate`) with its 95% interval. A final month (no job still followed) also has
 * its p-chart limits and signal; an estimate has neither.
 */
export interface MonthlyComebackPoint extends PChartRow {
  /** How `rate` was estimated (as the comparison's estimate); null with no jobs. */
  method: ComebackEstimateFigures['method'];
  /** 95%: log–log Kaplan–Meier, or the ratio's exact interval times the network's probability. */
  interval: Interval | null;
  /** Jobs of the month still inside their window without a counted comeback. */
  stillFollowed: number;
  /** Jobs followed through the whole window (or back on its last day). */
  followedThrough: number;
  /** True while any job of the month is still followed: `rate` is an estimate, never judged. */
  provisional: boolean;
}

export interface MonthlyComebacks {
  shop: ShopRef;
  /** p-chart centre: the shop's own rate over its final months (null with none). */
  center: number | null;
  points: MonthlyComebackPoint[];
}

export interface MonthlyTurnaround {
  shop: ShopRef;
  points: {
    label: string;
    count: number;
    customerMedian: number | null;
    customerP90: number | null;
    benchMedian: number | null;
    benchP90: number | null;
  }[];
}

export interface MonthlyRevenue {
  shop: ShopRef;
  points: {
    label: string;
    revenueCents: number;
    labourCents: number;
    benchMinutes: number;
    perBenchHourCents: number | null;
    realisation: number | null;
  }[];
}

export type TrendsResult =
  | {
      metric: 'comebacks';
      period: PeriodInfo;
      months: string[];
      /** The warranty window the estimates are for, days. */
      warrantyDays: number;
      shops: MonthlyComebacks[];
    }
  | { metric: 'turnaround'; period: PeriodInfo; months: string[]; shops: MonthlyTurnaround[] }
  | { metric: 'revenue'; period: PeriodInfo; months: string[]; shops: MonthlyRevenue[] };

export interface HistogramBin {
  /** Business minutes, [from, to); the last bin is open-ended when `to` is null. */
  from: number;
  to: number | null;
  customer: number;
  bench: number;
}

export interface ShopComeback {
  id: number;
  jobId: number;
  originalJobId: number;
  collectedAt: string;
  detectedAt: string;
  daysSinceCollection: number;
  symptom: string | null;
  status: 'open' | 'confirmed' | 'dismissed';
  attribution: ComebackAttribution | null;
  rootCause: string | null;
  disposition: string | null;
  /** Whether it is an event of the period's comeback rate. */
  counted: boolean;
}

export interface RevenueGroup {
  key: string;
  label: string;
  jobs: number;
  revenueCents: number;
  labourCents: number;
  benchMinutes: number;
  perBenchHourCents: number | null;
  realisation: number | null;
}

export interface OpenJob {
  id: number;
  state: 'checked_in' | 'on_bench' | 'waiting_parts' | 'ready';
  serviceType: string;
  checkedInAt: string;
  promisedAt: string | null;
  customerName: string;
  reel: string;
  technicianName: string | null;
  daysOpen: number;
}

export interface ShopMetricsResult {
  period: PeriodInfo;
  settings: NetworkComparisonResult['settings'];
  reference: NetworkComparisonResult['reference'];
  network: NetworkTotals;
  figures: ShopFigures;
  histogram: { binMinutes: number; bins: HistogramBin[] };
  comebacks: ShopComeback[];
  /** Per technician; a technician caller gets only their own row, never a colleague's money. */
  byTechnician: RevenueGroup[];
  /** True when `byTechnician` holds only the caller's own row (a technician). */
  ownTechnicianOnly: boolean;
  byServiceType: RevenueGroup[];
  /** Jobs not collected yet, by state, now. */
  openCounts: Record<OpenJob['state'], number>;
  /** Work not yet ready (checked in, on the bench, waiting on parts), oldest check-in first. */
  openLongest: OpenJob[];
}
