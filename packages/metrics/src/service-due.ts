import { civilDayNumber } from './business-time';

export type UseProfile = 'light' | 'heavy';

export interface Season {
  /** "MM-DD" */
  start: string;
  /** "MM-DD"; earlier than start means the season runs over the new year. */
  end: string;
}

const DAY = 86_400_000;

function formatDay(day: number): string {
  return new Date(day * DAY).toISOString().slice(0, 10);
}

function parseMonthDay(value: string): [number, number] {
  const m = /^(\d{2})-(\d{2})$/.exec(value);
  const month = Number(m?.[1]);
  const day = Number(m?.[2]);
  if (!m || month < 1 || month > 12 || day < 1 || day > 31) {
    throw new RangeError(`Expected a "MM-DD" season date, got "${value}"`);
  }
  return [month, day];
}

/** Day number of month/day in a year, clamped to the month's last day (29 Feb → 28 Feb). */
function dayIn(year: number, [month, day]: [number, number]): number {
  const last = new Date(Date.UTC(year, month, 0)).getUTCDate();
  return Date.UTC(year, month - 1, Math.min(day, last)) / DAY;
}

/**
 * Date the next service of a reel is due, "YYYY-MM-DD" (README, figures table; the
 * intervals are common shop practice, not from a published source):
 * - light use: about once a year, i.e. one year after the last service (29 Feb → 28 Feb);
 * - heavy use: at the start, middle and end of the season — the first of those dates strictly
 *   after the last service. The middle is halfway from start to end, rounded down; a season
 *   whose end is before its start runs over the new year.
 *
 * Throws RangeError on a malformed date.
 */
export function nextServiceDue(lastServiceOn: string, profile: UseProfile, season: Season): string {
  const last = civilDayNumber(lastServiceOn);
  const year = new Date(last * DAY).getUTCFullYear();
  const start = parseMonthDay(season.start);
  const end = parseMonthDay(season.end);
  if (profile === 'light') {
    const [, month, day] = lastServiceOn.split('-').map(Number);
    return formatDay(dayIn(year + 1, [month!, day!]));
  }
  if (profile !== 'heavy') throw new RangeError(`Unknown use profile "${String(profile)}"`);
  const wraps = end[0] * 100 + end[1] < start[0] * 100 + start[1];
  let best = Infinity;
  for (let y = year - 1; y <= year + 1; y++) {
    const s = dayIn(y, start);
    const e = dayIn(wraps ? y + 1 : y, end);
    for (const point of [s, s + Math.floor((e - s) / 2), e]) {
      if (point > last && point < best) best = point;
    }
  }
  return formatDay(best);
}

export interface ReminderCandidate {
  lastServiceOn: string;
  profile: UseProfile;
  reminderConsent: boolean;
}

/**
 * Reels to remind about before the season: those whose owner consented to reminders and
 * whose next service (nextServiceDue) falls on or before asOf + withinDays, earliest first,
 * each with its `dueOn`. Overdue reels are included. Empty input gives [].
 */
export function serviceReminders<T extends ReminderCandidate>(
  reels: readonly T[],
  options: { asOf: string; withinDays: number; season: Season },
): Array<T & { dueOn: string }> {
  const horizon = civilDayNumber(options.asOf) + options.withinDays;
  return reels
    .filter((r) => r.reminderConsent)
    .map((r) => ({ ...r, dueOn: nextServiceDue(r.lastServiceOn, r.profile, options.season) }))
    .filter((r) => civilDayNumber(r.dueOn) <= horizon)
    .sort((a, b) => (a.dueOn < b.dueOn ? -1 : a.dueOn > b.dueOn ? 1 : 0));
}
