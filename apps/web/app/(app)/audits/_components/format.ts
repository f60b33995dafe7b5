import { formatInZone } from '~/lib/format';

const money = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });

export const formatCents = (cents: number) => money.format(cents / 100);

/** A local date "YYYY-MM-DD" as "1 Nov 2026" (no time zone: it already is the shop's date). */
export function formatLocalDate(date: string, withWeekday = false) {
  return new Date(`${date}T12:00:00Z`).toLocaleDateString('en-GB', {
    weekday: withWeekday ? 'short' : undefined,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    timeZone: 'UTC',
  });
}

/** "1–30 Nov 2026", "28 Oct – 3 Nov 2026", "29 Dec 2026 – 4 Jan 2027". */
export function formatPeriod(from: string, to: string) {
  if (from === to) return formatLocalDate(from);
  const [fy, fm] = from.split('-');
  const [ty, tm] = to.split('-');
  const day = (d: string) => String(Number(d.slice(8)));
  const month = (d: string) =>
    new Date(`${d}T12:00:00Z`).toLocaleDateString('en-GB', { month: 'short', timeZone: 'UTC' });
  if (fy === ty && fm === tm) return `${day(from)}–${day(to)} ${month(to)} ${ty}`;
  if (fy === ty) return `${day(from)} ${month(from)} – ${day(to)} ${month(to)} ${ty}`;
  return `${formatLocalDate(from)} – ${formatLocalDate(to)}`;
}

/** "Job audit form, version 2" as titled, or with the version added when the title lacks it. */
export const formLabel = (title: string, version: number) =>
  /version\s+\d+/i.test(title) ? title : `${title} (version ${version})`;

/** An instant (ISO string) in the shop's zone. */
export const formatInstant = (iso: string, timeZone: string, pattern = 'd MMM yyyy, HH:mm') =>
  formatInZone(new Date(iso), timeZone, pattern);

export function formatMinutes(minutes: number) {
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  return h ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min`;
}

export const formatScore = (score: number) =>
  Number.isInteger(score) ? String(score) : score.toFixed(1);
