import { JOB_STATES } from '@reelwright/db/values';

export { JOB_STATES };
export type JobState = (typeof JOB_STATES)[number];

export const JOB_STATE_LABELS: Record<JobState, string> = {
  checked_in: 'Checked in',
  on_bench: 'On the bench',
  waiting_parts: 'Waiting on parts',
  ready: 'Ready for pickup',
  collected: 'Collected',
};

export const SERVICE_LABELS = {
  tune_up: 'Tune-up',
  overhaul: 'Overhaul',
  repair: 'Repair',
  parts_install: 'Parts install',
} as const;

export const REEL_KIND_LABELS = {
  spinning: 'Spinning',
  baitcasting: 'Baitcasting',
  conventional: 'Conventional',
  lever_drag: 'Lever-drag',
  fly: 'Fly',
  spincast: 'Spincast',
} as const;
