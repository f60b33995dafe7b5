export {
  businessDays,
  businessMinutes,
  civilDayNumber,
  localDayNumber,
  WEEKDAYS,
  type OpeningSpan,
  type ShopCalendar,
  type Weekday,
} from './business-time';
export { quantile, quantileSorted } from './quantile';
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
