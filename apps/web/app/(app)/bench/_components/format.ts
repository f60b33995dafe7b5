import type { JobState } from '~/lib/labels';

const dollars = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });

export const formatCents = (cents: number) => dollars.format(cents / 100);

/** "2 h 05 min", "45 min", "0 min". */
export function formatMinutes(minutes: number) {
  const m = Math.round(minutes);
  if (m < 60) return `${m} min`;
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`;
}

export const STEP_GROUP_LABELS: Record<string, string> = {
  teardown: 'Teardown',
  cleaning: 'Cleaning',
  inspection: 'Inspection',
  lubrication: 'Lubrication',
  drag: 'Drag',
  reassembly: 'Reassembly',
  test_crank: 'Test crank',
};

/** What the button that makes a move says, by where the job is and where it goes. */
export function moveLabel(from: JobState, to: JobState) {
  if (to === 'on_bench')
    return from === 'waiting_parts' ? 'Parts are in: back on the bench' : 'Start bench work';
  if (to === 'waiting_parts') return 'Waiting on parts';
  if (to === 'ready') return 'Ready for pickup';
  if (to === 'collected') return 'Collected by the customer';
  return to;
}

export const USE_LABELS: Record<string, string> = { light: 'Light use', heavy: 'Hard use' };
export const WATER_LABELS: Record<string, string> = { salt: 'Salt water', fresh: 'Fresh water' };

const civil = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  timeZone: 'UTC',
});

/** A local date "YYYY-MM-DD" as "8 Apr 2026" (a calendar date: no time zone shift). */
export const formatCivilDate = (date: string) => civil.format(new Date(`${date}T12:00:00Z`));
