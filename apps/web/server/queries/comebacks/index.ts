// Comeback reads: the review queues, one review, a job's flag and the shop page breakdown.
export { comebackBreakdown, type BreakdownRow, type ComebackBreakdown } from './breakdown';
export { getComeback, redoCost, type ComebackDetail, type JobFacts } from './detail';
export { jobComeback, type JobComeback } from './job';
export { LIST_LIMIT, listComebacks, type ComebackList, type ComebackRow } from './list';
export { reviewRights, type ReviewRights } from './shared';
