import { tzOffset } from '@date-fns/tz';
import type { OpeningHours, Weekday } from '../schema/shops';

const MINUTE = 60_000;
const DAY = 86_400_000;
const WEEKDAYS: readonly Weekday[] = ['sun', 'mon', 'tue', 'wed', 'thu', 'fri', 'sat'];

export interface CalendarInput {
  timeZone: string;
  weekly: OpeningHours;
  closedDates: readonly string[];
}

/**
 * A shop's open intervals over the seeded years as sorted UTC ranges, for moving an instant
 * forward by business minutes while simulating. (The stored turnaround figures come from
 * @reelwright/metrics, not from here.)
 */
export interface OpenTimeline {
  readonly timeZone: string;
  readonly starts: number[];
  readonly ends: number[];
  /** Local month (1–12) of each interval. */
  readonly months: number[];
  /** Open minutes on an ordinary full week, for scaling "business days". */
  readonly minutesPerOpenDay: number;
}

function clock(value: string): [number, number] {
  const [h, m] = value.split(':').map(Number);
  return [h ?? 0, m ?? 0];
}

export function isoDate(y: number, m: number, d: number): string {
  return `${y}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
}

/** Local calendar date of an instant in a zone, "YYYY-MM-DD". */
export function localDate(ms: number, timeZone: string): string {
  const local = new Date(ms + tzOffset(timeZone, new Date(ms)) * MINUTE);
  return isoDate(local.getUTCFullYear(), local.getUTCMonth() + 1, local.getUTCDate());
}

export function buildTimeline(cal: CalendarInput, fromMs: number, toMs: number): OpenTimeline {
  const closed = new Set(cal.closedDates);
  const starts: number[] = [];
  const ends: number[] = [];
  const months: number[] = [];
  let openDays = 0;
  let openMinutes = 0;
  // Walk civil dates in UTC so DST never skips or repeats a day. One offset per day, taken at
  // midday: zone changes happen at night, outside every shop's hours.
  for (let day = Math.floor(fromMs / DAY) - 1; day <= Math.ceil(toMs / DAY) + 1; day++) {
    const civil = new Date(day * DAY);
    const y = civil.getUTCFullYear();
    const m = civil.getUTCMonth() + 1;
    const d = civil.getUTCDate();
    if (closed.has(isoDate(y, m, d))) continue;
    const spans = cal.weekly[WEEKDAYS[civil.getUTCDay()]!] ?? [];
    if (spans.length === 0) continue;
    openDays++;
    const offset = tzOffset(cal.timeZone, new Date(Date.UTC(y, m - 1, d, 17))) * MINUTE;
    for (const span of spans) {
      const [oh, om] = clock(span.open);
      const [ch, cm] = clock(span.close);
      const a = Date.UTC(y, m - 1, d, oh, om) - offset;
      const b = Date.UTC(y, m - 1, d, ch, cm) - offset;
      if (b > a) {
        starts.push(a);
        ends.push(b);
        months.push(m);
        openMinutes += (b - a) / MINUTE;
      }
    }
  }
  return {
    timeZone: cal.timeZone,
    starts,
    ends,
    months,
    minutesPerOpenDay: openDays > 0 ? openMinutes / openDays : 0,
  };
}

/** Index of the first interval ending after `t`. */
function firstEndingAfter(tl: OpenTimeline, t: number): number {
  let lo = 0;
  let hi = tl.ends.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (tl.ends[mid]! <= t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Local month of the opening interval at or after `t`. */
export function monthAt(tl: OpenTimeline, t: number): number {
  const i = Math.min(firstEndingAfter(tl, t), tl.months.length - 1);
  return tl.months[i] ?? 1;
}

/** `t` if the shop is open then, else the next opening. */
export function nextOpen(tl: OpenTimeline, t: number): number {
  const i = firstEndingAfter(tl, t);
  if (i >= tl.starts.length) return t;
  return Math.max(t, tl.starts[i]!);
}

/** The instant `minutes` business minutes after `t` (whole minutes). */
export function addBusinessMinutes(tl: OpenTimeline, t: number, minutes: number): number {
  let left = Math.max(0, Math.round(minutes)) * MINUTE;
  let i = firstEndingAfter(tl, t);
  let at = t;
  while (i < tl.starts.length) {
    at = Math.max(at, tl.starts[i]!);
    const room = tl.ends[i]! - at;
    if (left <= room) return at + left;
    left -= room;
    i++;
  }
  return at + left;
}

/**
 * Pieces of work of `minutes` business minutes starting at `t`, split where the shop closes
 * (a technician stops the timer at closing time).
 */
export function placeWork(tl: OpenTimeline, t: number, minutes: number): [number, number][] {
  const pieces: [number, number][] = [];
  let left = Math.max(1, Math.round(minutes)) * MINUTE;
  let i = firstEndingAfter(tl, t);
  let at = t;
  while (left > 0 && i < tl.starts.length) {
    at = Math.max(at, tl.starts[i]!);
    const room = tl.ends[i]! - at;
    const take = Math.min(room, left);
    if (take > 0) pieces.push([at, at + take]);
    left -= take;
    at += take;
    i++;
  }
  if (left > 0) pieces.push([at, at + left]);
  return pieces;
}
