import { TZDate } from '@date-fns/tz';
import {
  businessDays,
  civilDayNumber,
  localDayNumber,
  quantile,
  WEEKDAYS,
  type ShopCalendar,
} from '@reelwright/metrics';
import type { Shop } from '@reelwright/db/schema';

const DAY = 86_400_000;

export function shopCalendar(shop: Pick<Shop, 'timeZone' | 'openingHours' | 'closedDates'>) {
  return {
    timeZone: shop.timeZone,
    weekly: shop.openingHours,
    closedDates: shop.closedDates,
  } satisfies ShopCalendar;
}

const dateOfDay = (day: number) => new Date(day * DAY).toISOString().slice(0, 10);

/** The shop-local date ("YYYY-MM-DD") of an instant. */
export function localDate(instant: Date, timeZone: string): string {
  return dateOfDay(localDayNumber(instant, timeZone));
}

/** The instant a local date's clock shows `clock` ("HH:mm") in the zone. */
export function atLocal(date: string, clock: string, timeZone: string): Date {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const [h, min] = clock.split(':').map(Number) as [number, number];
  // "24:00" is the next midnight; TZDate rolls the hour over.
  return new Date(new TZDate(y, m - 1, d, h, min, 0, timeZone).getTime());
}

function spansOf(date: string, calendar: ShopCalendar) {
  const weekday = WEEKDAYS[(((civilDayNumber(date) + 3) % 7) + 7) % 7]!;
  return calendar.weekly[weekday] ?? [];
}

/** Whether the shop opens on a local date: one business day between its noon and the next. */
export function isOpenOn(date: string, calendar: ShopCalendar): boolean {
  const noon = atLocal(date, '12:00', calendar.timeZone);
  const next = atLocal(dateOfDay(civilDayNumber(date) + 1), '12:00', calendar.timeZone);
  return businessDays(noon, next, calendar) === 1;
}

/** The promise instant for a local date: the shop's last closing time that day, else 17:00. */
export function promiseInstant(date: string, calendar: ShopCalendar): Date {
  const closes = spansOf(date, calendar)
    .map((s) => s.close)
    .sort();
  const close = isOpenOn(date, calendar) ? closes[closes.length - 1] : undefined;
  return atLocal(date, close ?? '17:00', calendar.timeZone);
}

/** The local date after `date`. */
export const nextDate = (date: string) => dateOfDay(civilDayNumber(date) + 1);

/** The `n`th open local date after the local date of `from` (n ≥ 1). */
export function addOpenDays(from: Date, n: number, calendar: ShopCalendar): string {
  let day = localDayNumber(from, calendar.timeZone);
  let counted = 0;
  // A shop closed for more than a year is not a shop; stop rather than loop forever.
  for (let guard = 0; guard < 400 && counted < n; guard++) {
    day += 1;
    if (isOpenOn(dateOfDay(day), calendar)) counted += 1;
  }
  return dateOfDay(day);
}

/** Mean open minutes of the weekdays the shop opens at all. */
export function openMinutesPerDay(calendar: ShopCalendar): number {
  const toMinutes = (clock: string) => {
    const [h, m] = clock.split(':').map(Number) as [number, number];
    return h * 60 + m;
  };
  const perDay = WEEKDAYS.map((w) =>
    (calendar.weekly[w] ?? []).reduce((t, s) => t + toMinutes(s.close) - toMinutes(s.open), 0),
  ).filter((m) => m > 0);
  if (perDay.length === 0) return 8 * 60;
  return perDay.reduce((a, b) => a + b, 0) / perDay.length;
}

export const MIN_SAMPLE = 10;
export const FALLBACK_DAYS = 5;

export interface PromiseSuggestion {
  /** Business days from check-in, rounded up. */
  businessDays: number;
  /** p90 of the sample in business days (null for the fallback). */
  p90Days: number | null;
  sampleSize: number;
  basis: 'recent' | 'history' | 'default';
  promisedOn: string;
  promisedAt: Date;
}

/**
 * The promised date to offer at check-in: the 90th percentile (Hyndman & Fan type 7) of the
 * sample's bench turnaround, converted from business minutes to business days at the shop's mean
 * open day, rounded up, counted in open days after today. `recent` is the shop's jobs that became
 * ready in the last 90 days; `history` its latest ready jobs, used when the recent sample is under
 * MIN_SAMPLE; with both short, FALLBACK_DAYS.
 */
export function suggestPromise(
  calendar: ShopCalendar,
  sample: { recent: readonly number[]; history: readonly number[] },
  now: Date,
): PromiseSuggestion {
  const basis =
    sample.recent.length >= MIN_SAMPLE
      ? 'recent'
      : sample.history.length >= MIN_SAMPLE
        ? 'history'
        : 'default';
  const minutes = basis === 'recent' ? sample.recent : basis === 'history' ? sample.history : [];
  const perDay = openMinutesPerDay(calendar);
  const p90Days = minutes.length > 0 ? quantile(minutes, 0.9) / perDay : null;
  const days = p90Days === null ? FALLBACK_DAYS : Math.max(1, Math.ceil(p90Days - 1e-9));
  const promisedOn = addOpenDays(now, days, calendar);
  return {
    businessDays: days,
    p90Days,
    sampleSize: minutes.length,
    basis,
    promisedOn,
    promisedAt: promiseInstant(promisedOn, calendar),
  };
}
