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

export function formatPeriod(from: string, to: string) {
  return from === to ? formatLocalDate(from) : `${formatLocalDate(from)} – ${formatLocalDate(to)}`;
}

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
