import type { Db } from '@reelwright/db';
import { comebackReference, type ComebackReference } from '@reelwright/metrics';
import type { PeriodQuery } from '~/lib/validators/network';
import { addDays } from '../../audits/sampling';
import type { NetworkSettingsUsed } from './context';
import { addInto, emptyTable, followUpTables } from './follow-up';

/** A local date `months` calendar months earlier, the day clamped to the month's length. */
export function monthsBefore(date: string, months: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  const index = y * 12 + (m - 1) - months;
  const year = Math.floor(index / 12);
  const month = (index % 12) + 1;
  const last = new Date(Date.UTC(year, month, 0)).getUTCDate();
  return `${year}-${String(month).padStart(2, '0')}-${String(Math.min(d, last)).padStart(2, '0')}`;
}

/** The reference period of a period: the `months` whole months (by date) before it starts. */
export function referencePeriod(period: PeriodQuery, months: number): PeriodQuery {
  return { from: monthsBefore(period.from, months), to: addDays(period.from, -1) };
}

export interface LoadedReference {
  period: PeriodQuery;
  /** Jobs of the reference period (all shops of the network). */
  jobs: number;
  reference: ComebackReference | null;
}

interface Cached {
  at: number;
  asOf: number;
  value: Promise<LoadedReference>;
}

// The reference curve is twelve months of the whole network: a quarter of an hour moves it by a
// few days' follow-up of a few jobs among tens of thousands, far below its own uncertainty, while
// reading its open months is the dearest part of a request. So it is kept, per database, for a
// short while; the period's own figures are never cached. Each instance keeps its own: two may
// differ by at most the same quarter of an hour, and a change of settings is a new key in both.
const CACHE_MS = 15 * 60_000;
const cache = new WeakMap<Db, Map<string, Cached>>();

/**
 * The network's reference for standardized ratios: the follow-up of every job of the network
 * collected in the reference period (default the twelve months before the period), its
 * Nelson–Aalen cumulative hazard and Kaplan–Meier W-day probability (`comebackReference`), null
 * when no job of it has been followed through the window. Kept for up to 15 minutes of wall
 * clock and of as-of instant, per database, period and settings.
 */
export function loadReference(
  conn: Db,
  period: PeriodQuery,
  asOf: Date,
  settings: NetworkSettingsUsed & { referenceMonths: number },
  options: { cache?: boolean } = {},
): Promise<LoadedReference> {
  const ref = referencePeriod(period, settings.referenceMonths);
  const key = [
    ref.from,
    ref.to,
    settings.warrantyDays,
    [...settings.countedAttributions].sort().join(','),
  ].join('|');
  const now = Date.now();
  const byKey = cache.get(conn) ?? new Map<string, Cached>();
  cache.set(conn, byKey);
  const hit = byKey.get(key);
  if (
    options.cache !== false &&
    hit &&
    now - hit.at < CACHE_MS &&
    Math.abs(asOf.getTime() - hit.asOf) < CACHE_MS
  ) {
    return hit.value;
  }
  const value = followUpTables(conn, null, ref, asOf, settings).then((tables) => {
    const table = emptyTable(settings.warrantyDays);
    for (const t of tables.values()) addInto(table, t);
    const jobs =
      table.censored.reduce((a, b) => a + b, 0) + table.events.reduce((a, b) => a + b, 0);
    return { period: ref, jobs, reference: comebackReference(table, settings.warrantyDays) };
  });
  if (options.cache !== false) {
    byKey.set(key, { at: now, asOf: asOf.getTime(), value });
    value.catch(() => byKey.delete(key));
  }
  return value;
}
