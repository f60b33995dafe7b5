import { tzOffset } from '@date-fns/tz';

export type Weekday = 'mon' | 'tue' | 'wed' | 'thu' | 'fri' | 'sat' | 'sun';

/** Local opening span, "HH:mm" (or "HH:mm:ss"); `close` may be "24:00". Several spans a day are allowed. */
export interface OpeningSpan {
  open: string;
  close: string;
}

/** A shop's opening hours: IANA zone, weekly spans, and closed local dates ("YYYY-MM-DD"). */
export interface ShopCalendar {
  timeZone: string;
  weekly: Partial<Record<Weekday, OpeningSpan[]>>;
  closedDates: string[];
}

export const WEEKDAYS: readonly Weekday[] = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];

const MINUTE = 60_000;
const DAY = 86_400_000;
const HALF_DAY = DAY / 2;

/** Day number (days since 1970-01-01) of a civil date, in any zone. */
export function civilDayNumber(date: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new RangeError(`Expected a "YYYY-MM-DD" date, got "${date}"`);
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const ms = Date.UTC(y, mo - 1, d);
  const check = new Date(ms);
  if (check.getUTCFullYear() !== y || check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d) {
    throw new RangeError(`Not a calendar date: "${date}"`);
  }
  return ms / DAY;
}

/** Monday = 0 … Sunday = 6; day 0 (1970-01-01) was a Thursday. */
function weekdayOfDayNumber(day: number): number {
  return (((day + 3) % 7) + 7) % 7;
}

function parseClock(value: string): number {
  const m = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(value);
  if (!m) throw new RangeError(`Expected a "HH:mm" time, got "${value}"`);
  const h = Number(m[1]);
  const min = Number(m[2]);
  const s = Number(m[3] ?? 0);
  if (min > 59 || s > 59 || h > 24 || (h === 24 && (min > 0 || s > 0))) {
    throw new RangeError(`Not a clock time: "${value}"`);
  }
  return ((h * 60 + min) * 60 + s) * 1000;
}

/** Merged [open, close) spans of one weekday, in ms after local midnight, flattened. */
function mergeSpans(spans: readonly OpeningSpan[] | undefined): number[] {
  if (!spans || spans.length === 0) return [];
  const parsed = spans.map((s) => {
    const open = parseClock(s.open);
    const close = parseClock(s.close);
    if (close <= open) {
      throw new RangeError(`Opening span ${s.open}–${s.close} must close after it opens`);
    }
    return [open, close] as const;
  });
  parsed.sort((a, b) => a[0] - b[0]);
  const out: number[] = [];
  for (const [open, close] of parsed) {
    const last = out.length - 1;
    if (last > 0 && open <= out[last]!) out[last] = Math.max(out[last]!, close);
    else out.push(open, close);
  }
  return out;
}

// ---- zone offsets, cached per zone and UTC day ----

/** Per UTC day: a single offset (ms), or flattened [start, end, offset] pieces. */
type DayOffsets = number | number[];
const zoneCaches = new Map<string, Map<number, DayOffsets>>();

function offsetAt(timeZone: string, t: number): number {
  const minutes = tzOffset(timeZone, new Date(t));
  if (Number.isNaN(minutes)) throw new RangeError(`Unknown time zone "${timeZone}"`);
  return Math.round(minutes * MINUTE);
}

/** Splits [lo, hi) into constant-offset pieces; assumes at most one change per half day. */
function splitOffsets(
  zone: string,
  lo: number,
  hi: number,
  oLo: number,
  oHi: number,
  out: number[],
): void {
  if (oLo === oHi && hi - lo <= HALF_DAY) {
    const n = out.length;
    if (n > 0 && out[n - 1] === oLo && out[n - 2] === lo) out[n - 2] = hi;
    else out.push(lo, hi, oLo);
    return;
  }
  if (hi - lo <= 1) {
    out.push(lo, hi, oLo);
    return;
  }
  const mid = Math.floor((lo + hi) / 2);
  const oMidBefore = offsetAt(zone, mid - 1);
  const oMid = offsetAt(zone, mid);
  splitOffsets(zone, lo, mid, oLo, oMidBefore, out);
  splitOffsets(zone, mid, hi, oMid, oHi, out);
}

function utcDayOffsets(zone: string, utcDay: number): DayOffsets {
  let cache = zoneCaches.get(zone);
  if (!cache) {
    cache = new Map();
    zoneCaches.set(zone, cache);
  }
  const hit = cache.get(utcDay);
  if (hit !== undefined) return hit;
  const a = utcDay * DAY;
  const b = a + DAY;
  const oa = offsetAt(zone, a);
  const om = offsetAt(zone, a + HALF_DAY);
  const ob = offsetAt(zone, b - 1);
  let result: DayOffsets;
  if (oa === om && om === ob) result = oa;
  else {
    const pieces: number[] = [];
    splitOffsets(zone, a, b, oa, ob, pieces);
    result = pieces.length === 3 ? pieces[2]! : pieces;
  }
  cache.set(utcDay, result);
  return result;
}

function zoneOffsetAt(zone: string, t: number): number {
  const d = utcDayOffsets(zone, Math.floor(t / DAY));
  if (typeof d === 'number') return d;
  for (let i = 0; i < d.length; i += 3) if (t < d[i + 1]!) return d[i + 2]!;
  return d[d.length - 1]!;
}

/** Local day number of an instant in a zone, using the offset in force at that instant. */
export function localDayNumber(instant: Date, timeZone: string): number {
  const t = instant.getTime();
  return Math.floor((t + zoneOffsetAt(timeZone, t)) / DAY);
}

// ---- per-calendar open intervals with prefix sums ----

interface CalendarCache {
  timeZone: string;
  weekly: ShopCalendar['weekly'];
  closedDates: string[];
  closedLength: number;
  spans: number[][];
  closed: Set<number>;
  /** Local days [d0, d1) are built. */
  d0: number;
  d1: number;
  starts: Float64Array;
  ends: Float64Array;
  /** cum[i] = open ms of intervals before i. */
  cum: Float64Array;
  /** For UTC day u in [d0, d1): first interval index ending after u's midnight. */
  firstByUtcDay: Int32Array;
  /** openDays[k] = open local days in [d0, d0 + k). */
  openDays: Int32Array;
}

const calendarCaches = new WeakMap<ShopCalendar, CalendarCache>();

function isOpenDay(c: CalendarCache, day: number): boolean {
  return !c.closed.has(day) && (c.spans[weekdayOfDayNumber(day)]?.length ?? 0) > 0;
}

/** Open instants of local day `day`: instants whose wall-clock date is `day` and time is in a span. */
function dayIntervals(c: CalendarCache, day: number, out: number[]): void {
  if (!isOpenDay(c, day)) return;
  const spans = c.spans[weekdayOfDayNumber(day)]!;
  const midnight = day * DAY;
  for (let u = day - 1; u <= day + 1; u++) {
    const offs = utcDayOffsets(c.timeZone, u);
    const pieces = typeof offs === 'number' ? [u * DAY, (u + 1) * DAY, offs] : offs;
    for (let p = 0; p < pieces.length; p += 3) {
      const pa = pieces[p]!;
      const pb = pieces[p + 1]!;
      const off = pieces[p + 2]!;
      for (let s = 0; s < spans.length; s += 2) {
        const start = Math.max(midnight + spans[s]! - off, pa);
        const end = Math.min(midnight + spans[s + 1]! - off, pb);
        if (end <= start) continue;
        const n = out.length;
        if (n > 0 && out[n - 1] === start) out[n - 1] = end;
        else out.push(start, end);
      }
    }
  }
}

function build(c: CalendarCache, d0: number, d1: number): void {
  const flat: number[] = [];
  const openDays = new Int32Array(d1 - d0 + 1);
  for (let d = d0; d < d1; d++) {
    openDays[d - d0 + 1] = openDays[d - d0]! + (isOpenDay(c, d) ? 1 : 0);
    const day: number[] = [];
    dayIntervals(c, d, day);
    for (const v of day) flat.push(v);
  }
  // Instants of different local days never overlap, but a fall-back across midnight can reorder them.
  const order = Array.from({ length: flat.length / 2 }, (_, i) => i);
  order.sort((a, b) => flat[2 * a]! - flat[2 * b]!);
  const n = order.length;
  const starts = new Float64Array(n);
  const ends = new Float64Array(n);
  const cum = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    const k = order[i]!;
    starts[i] = flat[2 * k]!;
    ends[i] = flat[2 * k + 1]!;
    cum[i + 1] = cum[i]! + ends[i]! - starts[i]!;
  }
  const firstByUtcDay = new Int32Array(d1 - d0);
  let i = 0;
  for (let u = d0; u < d1; u++) {
    while (i < n && ends[i]! <= u * DAY) i++;
    firstByUtcDay[u - d0] = i;
  }
  Object.assign(c, { d0, d1, starts, ends, cum, firstByUtcDay, openDays });
}

function calendarCache(calendar: ShopCalendar): CalendarCache {
  const hit = calendarCaches.get(calendar);
  if (
    hit &&
    hit.timeZone === calendar.timeZone &&
    hit.weekly === calendar.weekly &&
    hit.closedDates === calendar.closedDates &&
    hit.closedLength === calendar.closedDates.length
  ) {
    return hit;
  }
  offsetAt(calendar.timeZone, 0);
  const c: CalendarCache = {
    timeZone: calendar.timeZone,
    weekly: calendar.weekly,
    closedDates: calendar.closedDates,
    closedLength: calendar.closedDates.length,
    spans: WEEKDAYS.map((w) => mergeSpans(calendar.weekly[w])),
    closed: new Set(calendar.closedDates.map(civilDayNumber)),
    d0: 0,
    d1: 0,
    starts: new Float64Array(0),
    ends: new Float64Array(0),
    cum: new Float64Array(1),
    firstByUtcDay: new Int32Array(0),
    openDays: new Int32Array(1),
  };
  calendarCaches.set(calendar, c);
  return c;
}

/** Makes sure UTC days [uLo, uHi] can be answered: local days two either side are built. */
function ensure(c: CalendarCache, uLo: number, uHi: number): void {
  const need0 = uLo - 2;
  const need1 = uHi + 3;
  if (c.d1 > c.d0 && need0 >= c.d0 && need1 <= c.d1) return;
  // Grow generously so a stream of jobs rebuilds the arrays only a few times.
  const pad = Math.max(366, c.d1 - c.d0);
  const d0 = c.d1 > c.d0 ? Math.min(c.d0, need0 < c.d0 ? need0 - pad : c.d0) : need0 - 31;
  const d1 = c.d1 > c.d0 ? Math.max(c.d1, need1 > c.d1 ? need1 + pad : c.d1) : need1 + 31;
  build(c, d0, d1);
}

/** Open ms from the start of the built range up to instant t. */
function openBefore(c: CalendarCache, t: number): number {
  let i = c.firstByUtcDay[Math.floor(t / DAY) - c.d0]!;
  let sum = c.cum[i]!;
  const n = c.starts.length;
  while (i < n && c.starts[i]! < t) {
    const end = c.ends[i]!;
    sum += (end < t ? end : t) - c.starts[i]!;
    i++;
  }
  return sum;
}

// Far-off instants are almost always bad data; building days out to them would cost memory.
const EARLIEST = Date.UTC(1800, 0, 1);
const LATEST = Date.UTC(2400, 0, 1);

function instantMs(d: Date, name: string): number {
  const t = d.getTime();
  if (Number.isNaN(t)) throw new RangeError(`${name} is not a valid date`);
  if (t < EARLIEST || t >= LATEST) throw new RangeError(`${name} is outside the years 1800–2399`);
  return t;
}

/**
 * Business minutes: the length of the instants in [from, to) whose wall-clock time in
 * `calendar.timeZone` (converted with the offset in force at that instant) falls inside an
 * opening span of that local date, on a date that is not closed.
 *
 * Across a spring-forward change a span loses the skipped wall-clock time; across a fall-back
 * change the repeated wall-clock time counts twice (the shop is open through both). Overlapping
 * spans of one day count once. Minutes are exact (fractional when instants carry seconds).
 * Returns 0 when `to <= from` or no span is open. Throws RangeError on an invalid date or one
 * outside 1800–2399 (bad data), an unknown zone, a malformed "HH:mm" time or a span that does
 * not close after it opens.
 *
 * The calendar is treated as immutable: its open intervals are cached per calendar object.
 */
export function businessMinutes(from: Date, to: Date, calendar: ShopCalendar): number {
  return businessMinutesMs(instantMs(from, 'from'), instantMs(to, 'to'), calendar);
}

/** businessMinutes on epoch milliseconds, for callers that already hold numbers. */
export function businessMinutesMs(a: number, b: number, calendar: ShopCalendar): number {
  const c = calendarCache(calendar);
  if (!(b > a)) return 0;
  if (a < EARLIEST || b >= LATEST)
    throw new RangeError('instants must be within the years 1800–2399');
  ensure(c, Math.floor(a / DAY), Math.floor(b / DAY));
  return (openBefore(c, b) - openBefore(c, a)) / MINUTE;
}

/**
 * Business days: the open local dates d with day(from) <= d < day(to), where day() is the
 * local date in the shop's zone and an open date is a weekday with at least one span that is
 * not in `closedDates`. Same local day, or `to` before `from`, gives 0.
 */
export function businessDays(from: Date, to: Date, calendar: ShopCalendar): number {
  const a = instantMs(from, 'from');
  const b = instantMs(to, 'to');
  const c = calendarCache(calendar);
  const da = Math.floor((a + zoneOffsetAt(c.timeZone, a)) / DAY);
  const db = Math.floor((b + zoneOffsetAt(c.timeZone, b)) / DAY);
  if (db <= da) return 0;
  ensure(c, da, db);
  return c.openDays[db - c.d0]! - c.openDays[da - c.d0]!;
}
