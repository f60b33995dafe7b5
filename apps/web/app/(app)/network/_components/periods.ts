import { isLocalDate } from '~/lib/dates';
import { dayNumber, MAX_PERIOD_DAYS, TURNAROUND_UNITS, type TurnaroundUnit } from '~/lib/network';

// Periods are pairs of local dates; these helpers name them and list the presets of the picker.

export const PERIOD_KINDS = ['month', 'quarter', 'season', 'custom'] as const;
export type PeriodKind = (typeof PERIOD_KINDS)[number];

export interface Period {
  kind: PeriodKind;
  from: string;
  to: string;
}

const DAY = 86_400_000;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const pad = (n: number) => String(n).padStart(2, '0');

export const isoDate = (y: number, m: number, d: number) => `${y}-${pad(m)}-${pad(d)}`;

function fromDayNumber(day: number) {
  const d = new Date(day * DAY);
  return isoDate(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate());
}

export function addDays(date: string, days: number) {
  return fromDayNumber(dayNumber(date)! + days);
}

const lastDay = (y: number, m: number) => new Date(Date.UTC(y, m, 0)).getUTCDate();

export const monthPeriod = (y: number, m: number): Period => ({
  kind: 'month',
  from: isoDate(y, m, 1),
  to: isoDate(y, m, lastDay(y, m)),
});

export const quarterPeriod = (y: number, q: number): Period => ({
  kind: 'quarter',
  from: isoDate(y, q * 3 - 2, 1),
  to: isoDate(y, q * 3, lastDay(y, q * 3)),
});

/** The season of a year: from the earliest season start to the latest season end ("MM-DD"). */
export function seasonPeriod(
  y: number,
  seasons: readonly { start: string; end: string }[],
): Period {
  const start = seasons.map((s) => s.start).sort()[0] ?? '03-15';
  const end =
    seasons
      .map((s) => s.end)
      .sort()
      .at(-1) ?? '11-15';
  return { kind: 'season', from: `${y}-${start}`, to: `${y}-${end}` };
}

const parts = (date: string) => date.split('-').map(Number) as [number, number, number];

/** The latest calendar quarter that has ended by `today`: the default period. */
export function lastCompleteQuarter(today: string): Period {
  const [y, m] = parts(today);
  const q = Math.floor((m - 1) / 3) + 1;
  return q === 1 ? quarterPeriod(y - 1, 4) : quarterPeriod(y, q - 1);
}

/** The last whole calendar month before `today`'s: the network view's default period. */
export function lastWholeMonth(today: string): Period {
  const [y, m] = parts(today);
  return m === 1 ? monthPeriod(y - 1, 12) : monthPeriod(y, m - 1);
}

/**
 * The latest calendar quarter whose comeback figures are final, i.e. every job collected in it
 * has seen its warranty window close by `today`.
 */
export function latestFinalQuarter(today: string, warrantyDays: number): Period {
  let q = lastCompleteQuarter(today);
  while (addDays(q.to, warrantyDays + 1) > today) q = lastCompleteQuarter(q.from);
  return q;
}

/** Today's local date in a zone. */
export function todayIn(timeZone: string, now = new Date()) {
  return new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
  }).format(now);
}

/** Presets offered by the picker, newest first. */
export function monthOptions(today: string, count = 36) {
  const [y, m] = parts(today);
  return Array.from({ length: count }, (_, k) => {
    const index = y * 12 + (m - 1) - k;
    const p = monthPeriod(Math.floor(index / 12), (index % 12) + 1);
    return {
      value: p.from.slice(0, 7),
      label: `${MONTHS[index % 12]} ${Math.floor(index / 12)}`,
      period: p,
    };
  });
}

export function quarterOptions(today: string, count = 12) {
  const [y, m] = parts(today);
  const current = y * 4 + Math.floor((m - 1) / 3);
  return Array.from({ length: count }, (_, k) => {
    const index = current - k;
    const year = Math.floor(index / 4);
    const q = (index % 4) + 1;
    return { value: `${year}-Q${q}`, label: `Q${q} ${year}`, period: quarterPeriod(year, q) };
  });
}

export function seasonOptions(
  today: string,
  seasons: readonly { start: string; end: string }[],
  count = 3,
) {
  const [y] = parts(today);
  return Array.from({ length: count }, (_, k) => {
    const p = seasonPeriod(y - k, seasons);
    return {
      value: String(y - k),
      label: `Season ${y - k} (${formatPeriod(p.from, p.to)})`,
      period: p,
    };
  });
}

/** "1 Jul – 30 Sep 2026", "1 Jul 2025 – 30 Jun 2026", "1–31 Aug 2026". */
export function formatPeriod(from: string, to: string) {
  const [fy, fm, fd] = parts(from);
  const [ty, tm, td] = parts(to);
  if (fy === ty && fm === tm) return `${fd}–${td} ${MONTHS[tm - 1]} ${ty}`;
  if (fy === ty) return `${fd} ${MONTHS[fm - 1]} – ${td} ${MONTHS[tm - 1]} ${ty}`;
  return `${fd} ${MONTHS[fm - 1]} ${fy} – ${td} ${MONTHS[tm - 1]} ${ty}`;
}

/** "30 Dec 2026". */
export function formatDay(date: string) {
  const [y, m, d] = parts(date);
  return `${d} ${MONTHS[m - 1]} ${y}`;
}

/** "Jul 2026" for a "YYYY-MM" label. */
export function formatMonth(label: string) {
  const [y, m] = label.split('-').map(Number) as [number, number];
  return `${MONTHS[m - 1]} ${y}`;
}

/** The window the trend charts show: the twelve months to the period's end, or the whole period if longer. */
export function trendWindow(period: { from: string; to: string }) {
  const [y, m] = parts(period.to);
  const index = y * 12 + (m - 1) - 11;
  const start = isoDate(Math.floor(index / 12), (index % 12) + 1, 1);
  return { from: start < period.from ? start : period.from, to: period.to };
}

/** Whether a preset names exactly this pair of dates (so the picker shows it selected). */
export function kindOf(
  from: string,
  to: string,
  seasons: readonly { start: string; end: string }[],
): PeriodKind {
  const [fy, fm, fd] = parts(from);
  if (fd === 1 && to === monthPeriod(fy, fm).to) return 'month';
  if (fd === 1 && (fm - 1) % 3 === 0 && to === quarterPeriod(fy, (fm + 2) / 3).to) return 'quarter';
  const season = seasonPeriod(fy, seasons);
  if (season.from === from && season.to === to) return 'season';
  return 'custom';
}

export interface ViewParams {
  from: string;
  to: string;
  region?: number;
  units: TurnaroundUnit;
  /** The address asked for a period that is not valid; the default is shown instead. */
  invalid: boolean;
}

/**
 * Reads the view's address: `from`, `to` (local dates), `region` and `units`. A missing or bad
 * period falls back to the given default.
 */
export function readViewParams(
  search: Record<string, string | string[] | undefined>,
  fallback: { from: string; to: string },
): ViewParams {
  const one = (k: string) => {
    const v = search[k];
    return Array.isArray(v) ? v[0] : v;
  };
  const from = one('from');
  const to = one('to');
  const units = (TURNAROUND_UNITS as readonly string[]).includes(one('units') ?? '')
    ? (one('units') as TurnaroundUnit)
    : 'hours';
  const regionText = one('region');
  const region = regionText && /^\d{1,9}$/.test(regionText) ? Number(regionText) : undefined;
  const valid =
    from !== undefined &&
    to !== undefined &&
    isLocalDate(from) &&
    isLocalDate(to) &&
    to >= from &&
    dayNumber(to)! - dayNumber(from)! + 1 <= MAX_PERIOD_DAYS;
  if (!valid) {
    const asked = from !== undefined || to !== undefined;
    return { from: fallback.from, to: fallback.to, region, units, invalid: asked };
  }
  return { from, to, region, units, invalid: false };
}

export function viewHref(
  path: string,
  params: { from: string; to: string; region?: number; units?: TurnaroundUnit },
) {
  const q = new URLSearchParams({ from: params.from, to: params.to });
  if (params.region !== undefined) q.set('region', String(params.region));
  if (params.units && params.units !== 'hours') q.set('units', params.units);
  return `${path}?${q.toString()}`;
}
