export {
  businessDays,
  businessMinutes,
  businessMinutesMs,
  civilDayNumber,
  localDayNumber,
  WEEKDAYS,
  type OpeningSpan,
  type ShopCalendar,
  type Weekday,
} from './business-time';
export { quantile, quantileSorted } from './quantile';
export { summariseSortedRuns, TURNAROUND_DIGITS } from './sorted-runs';
export {
  jobTurnaround,
  onTimeShare,
  turnaroundSummary,
  type JobTurnaround,
  type OnTimeShare,
  type TurnaroundInput,
  type TurnaroundSummary,
  type WaitingSpan,
} from './turnaround';
export { normalQuantile } from './normal';
export { binomialCdf, binomialPmf, binomialQuantile, binomialSurvival } from './binomial';
export { clopperPearsonInterval, wilsonInterval, type Interval } from './intervals';
export {
  compareShops,
  fairnessBand,
  funnelLimits,
  type FairnessBand,
  type NetworkComparison,
  type ShopComparison,
  type ShopCounts,
} from './funnel';
export {
  pChart,
  pChartLimits,
  type PChart,
  type PChartLimits,
  type PChartPoint,
  type PChartRow,
} from './p-chart';
export {
  AQLS,
  INSPECTION_LEVELS,
  MASTER_TABLES,
  REDUCED_SAMPLE_SIZES,
  SAMPLE_SIZES,
  TABLE_I,
  type InspectionLevel,
  type Severity,
} from './sampling/tables';
export {
  sampleSizeCodeLetter,
  singleSamplingPlan,
  tablePlan,
  type SingleSamplingPlan,
  type TablePlan,
} from './sampling/plan';
export {
  nextSeverity,
  type InspectedLot,
  type LotOutcome,
  type NextSeverity,
} from './sampling/switching';
export { drawSample } from './sampling/draw';
export {
  scoreAudit,
  type AuditAnswer,
  type AuditItem,
  type AuditScore,
  type AuditVerdict,
} from './audit-score';
export {
  billedRevenueCents,
  rateRealisation,
  revenuePerBenchHour,
  royaltyCents,
  type JobMoney,
  type RateRealisation,
} from './revenue';
export {
  nextServiceDue,
  serviceReminders,
  type ReminderCandidate,
  type Season,
  type UseProfile,
} from './service-due';
export {
  COMEBACK_ATTRIBUTIONS,
  comebackRate,
  DEFAULT_COUNTED_ATTRIBUTIONS,
  type ComebackAttribution,
  type ComebackRate,
  type ComebackRateJob,
} from './comebacks';
export {
  poissonCdf,
  poissonInterval,
  poissonPmf,
  poissonQuantile,
  poissonSurvival,
} from './poisson';
export {
  eventProbability,
  expectedEvents,
  followUp,
  followUpTable,
  hazardAt,
  kaplanMeier,
  mergeSurvivalTables,
  nelsonAalen,
  survivalAt,
  survivalTable,
  tableTotals,
  type CumulativeHazard,
  type EventProbability,
  type FollowUp,
  type FollowUpRow,
  type KaplanMeierCurve,
  type SurvivalTable,
} from './survival';
export {
  compareRatios,
  DEFAULT_MIN_EXPECTED,
  ratioBand,
  ratioFunnelLimits,
  standardizedRatio,
  type RatioBand,
  type RatioComparison,
  type RatioNote,
  type RatioShop,
  type StandardizedRatio,
} from './ratio';
export {
  comebackEstimate,
  comebackReference,
  expectedRate,
  type ComebackEstimate,
  type ComebackReference,
} from './comeback-estimate';
export { betaCdf, betaQuantile, logBeta, logGamma } from './beta';
export {
  betaBinomialLogLikelihood,
  fitBetaPrior,
  momentsPrior,
  shrinkRates,
  type Counts,
  type PriorFit,
  type ShrinkBand,
  type ShrinkOptions,
  type ShrunkRate,
} from './shrinkage';
