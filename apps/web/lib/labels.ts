export const JOB_STATES = [
  'checked_in',
  'on_bench',
  'waiting_parts',
  'ready',
  'collected',
] as const;
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
