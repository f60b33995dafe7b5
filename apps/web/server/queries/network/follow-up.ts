import { sql, type Db, type SQL } from '@reelwright/db';
import type { SurvivalTable } from '@reelwright/metrics';
import type { PeriodQuery } from '~/lib/validators/network';
import { addDays } from '../../audits/sampling';
import type { NetworkSettingsUsed } from './context';

const pgArray = (values: readonly (string | number)[]) => `{${values.join(',')}}`;

/** "YYYY-MM" of the month after. */
function nextMonth(month: string): string {
  const [y, m] = month.split('-').map(Number) as [number, number];
  return new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 7);
}

/** The whole months of a period, [first, end) as first days of months (as the comparison). */
function wholeMonthsOf(period: PeriodQuery): { first: string; end: string } {
  const after = addDays(period.to, 1);
  const first = period.from.endsWith('-01')
    ? period.from
    : `${nextMonth(period.from.slice(0, 7))}-01`;
  const end = `${after.slice(0, 7)}-01`;
  return first < end ? { first, end } : { first: after, end: after };
}

/**
 * Whether every warranty window of the period has closed by asOf in every zone (the period's end
 * taken 14 hours behind UTC, more than any zone lags): its figures are final.
 */
export function periodIsFinal(period: PeriodQuery, asOf: Date, warrantyDays: number): boolean {
  const end = Date.parse(`${addDays(period.to, 1)}T00:00:00Z`) + 14 * 3_600_000;
  return end + warrantyDays * 86_400_000 <= asOf.getTime();
}

/** A follow-up table with one entry per whole day 0…W, all zero. */
export function emptyTable(warrantyDays: number): SurvivalTable {
  return {
    time: Array.from({ length: warrantyDays + 1 }, (_, i) => i),
    events: new Array<number>(warrantyDays + 1).fill(0),
    censored: new Array<number>(warrantyDays + 1).fill(0),
  };
}

/** Adds tables of the same 0…W days into the first (in place). */
export function addInto(into: SurvivalTable, table: SurvivalTable): SurvivalTable {
  for (let i = 0; i < into.time.length; i++) {
    into.events[i]! += table.events[i] ?? 0;
    into.censored[i]! += table.censored[i] ?? 0;
  }
  return into;
}

/**
 * The follow-up table (`followUpTable` of @reelwright/metrics) of each shop's jobs collected in
 * the period, without reading a row per job where the answer is known: each job is followed from
 * its collection for f = min(W, ⌊(asOf − collected) / 24 h⌋) whole days, and its first counted
 * comeback (confirmed, with a counted attribution, inside the window, reported by asOf) on day d
 * is an event at d + 1 when d < f; otherwise it is censored at f.
 *
 * - Whole months whose windows have all closed (as in the comparison's trials) are read from
 *   shop_month_figures: all their jobs were followed for W days, so their count is censored at W.
 * - Other collections (days outside whole months, months with windows open) are grouped by f in
 *   SQL over the (shop, collected_at, id) index: at most W + 1 rows per shop and month come back.
 * - The comebacks are read from their own index, which carries the original collection time,
 *   grouped by f and event day; each moves its job from censored at f to an event at d + 1.
 *
 * Keys are shop ids, or "shopId:YYYY-MM" (the shop's local month of collection) with byMonth.
 */
export async function followUpTables(
  conn: Db,
  /** Null for every shop of the network. */
  shopIds: readonly number[] | null,
  period: PeriodQuery,
  asOf: Date,
  settings: NetworkSettingsUsed,
  options: { byMonth?: boolean } = {},
): Promise<Map<string, SurvivalTable>> {
  const out = new Map<string, SurvivalTable>();
  if (shopIds?.length === 0) return out;
  const w = settings.warrantyDays;
  const at = asOf.toISOString();
  const hours = w * 24;
  const closedBy = new Date(asOf.getTime() - hours * 3_600_000).toISOString();
  const counted = pgArray(settings.countedAttributions);
  const { first, end } = wholeMonthsOf(period);
  const byMonth = options.byMonth === true;
  const rawStart = period.from < first;
  const rawEnd = end < addDays(period.to, 1);
  const closedMonth = `${new Date(Date.parse(closedBy) - 14 * 3_600_000).toISOString().slice(0, 7)}-01`;
  const rawTail = rawEnd || end > closedMonth;
  const days = (from: SQL, to: SQL) =>
    sql`floor(extract(epoch from (${to} - ${from})) / 86400)::int`;
  const monthOf = (column: SQL) =>
    byMonth ? sql`to_char(${column} at time zone s.time_zone, 'YYYY-MM')` : sql`''`;
  const f = (column: SQL) => sql`least(${w}, ${days(column, sql`${at}::timestamptz`)})`;
  const rawRanges: SQL[] = [
    ...(rawStart ? [sql`(j.collected_at >= s.t0 and j.collected_at < s.m0)`] : []),
    ...(rawTail ? [sql`(j.collected_at >= s.c1 and j.collected_at < s.t1)`] : []),
  ];
  const { rows } = await conn.execute<{
    shopId: number;
    month: string;
    kind: 'c' | 'e';
    f: number;
    t: number | null;
    n: number;
  }>(sql`
    with s as (
      select x.id, x.time_zone,
        (${period.from}::date::timestamp at time zone x.time_zone) as t0,
        ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1,
        (${first}::date::timestamp at time zone x.time_zone) as m0,
        m.closed_end, (m.closed_end::timestamp at time zone x.time_zone) as c1
      from shops x
      cross join lateral (
        select greatest(${first}::date, least(${end}::date,
          date_trunc('month', ${closedBy}::timestamptz at time zone x.time_zone)::date)) as closed_end
      ) m
      ${shopIds ? sql`where x.id = any(${pgArray(shopIds)}::int[])` : sql``}
    )
    select s.id as "shopId", u.month, u.kind, u.f, u.t, u.n
    from s
    cross join lateral (
      select ${byMonth ? sql`to_char(m.month, 'YYYY-MM')` : sql`''`} as month, 'c' as kind,
        ${w}::int as f, null::int as t, ${byMonth ? sql`m.collected` : sql`sum(m.collected)`}::int as n
      from shop_month_figures m
      where m.shop_id = s.id and m.month >= ${first}::date and m.month < s.closed_end
      ${byMonth ? sql`` : sql`having sum(m.collected) > 0`}
      ${
        rawRanges.length > 0
          ? sql`union all
      select ${monthOf(sql`j.collected_at`)}, 'c', ${f(sql`j.collected_at`)}, null, count(*)::int
      from jobs j
      where j.shop_id = s.id and (${sql.join(rawRanges, sql` or `)})
        and j.collected_at <= ${at}::timestamptz
      group by 1, 3`
          : sql``
      }
      union all
      select k.month, 'e', k.f, case when k.d < k.f then k.d + 1 end, count(*)::int
      from (
        select ${monthOf(sql`cb.original_collected_at`)} as month,
          ${f(sql`cb.original_collected_at`)} as f,
          ${days(sql`cb.original_collected_at`, sql`min(cb.detected_at)`)} as d
        from comebacks cb
        where cb.original_shop_id = s.id
          and cb.original_collected_at >= s.t0 and cb.original_collected_at < s.t1
          and cb.detected_at >= cb.original_collected_at
          and cb.detected_at < cb.original_collected_at + ${`${hours} hours`}::interval
          and cb.detected_at <= ${at}::timestamptz
          and cb.status = 'confirmed'
          and cb.attribution = any(${counted}::comeback_attribution[])
        group by cb.original_job_id, cb.original_collected_at
      ) k
      group by 1, 3, 4
    ) u
  `);
  for (const r of rows) {
    const key = byMonth ? `${r.shopId}:${r.month}` : String(r.shopId);
    let table = out.get(key);
    if (!table) out.set(key, (table = emptyTable(w)));
    const at = Number(r.f);
    const n = Number(r.n);
    if (r.kind === 'c') table.censored[at]! += n;
    else if (r.t !== null) {
      table.events[Number(r.t)]! += n;
      table.censored[at]! -= n;
    }
  }
  return out;
}
