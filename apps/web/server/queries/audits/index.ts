// Audit reads, one file per concern; importers keep using `~/server/queries/audits`.
export { type JobRecord, jobRecord } from './job-record';
export { currentForm, formItems, formVersions, type FormItemView, passMark } from './forms';
export { planningOptions } from './planning';
export { roundScope, type RoundRow } from './round-row';
export {
  getRound,
  getRoundReport,
  listRounds,
  redrawCheck,
  type RedrawCheck,
  type ReportSample,
  type RoundDetail,
  type RoundSampleRow,
} from './rounds';
export { getSample, requireSampledJob, type SampleView } from './samples';
export { auditSummaryByShop, type ShopAuditSummary } from './summary';
