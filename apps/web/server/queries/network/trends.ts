import { sql, type Db } from '@reelwright/db';
import {
  pChart,
  pChartLimits,
  rateRealisation,
  revenuePerBenchHour,
  type PChartPoint,
} from '@reelwright/metrics';
import type {
  NetworkTrendsQuery,
  PeriodQuery,
  ShopTrendsQuery,
  TrendMetric,
} from '~/lib/validators/network';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import {
  loadSettings,
  loadShops,
  resolveContext,
  toRef,
  type NetworkShop,
  type QueryContext,
} from './context';
import type { MonthlyComebackPoint, TrendsResult } from './types';

/** "YYYY-MM" labels of every month the period touches, in order. */
export function monthsOf(period: PeriodQuery): string[] {
  const [fy, fm] = period.from.split('-').map(Number) as [number, number];
  const [ty, tm] = period.to.split('-').map(Number) as [number, number];
  const out: string[] = [];
  let [y, m] = [fy, fm];
  while (y < ty || (y === ty && m <= tm)) {
    out.push(`${y}-${String(m).padStart(2, '0')}`);
    [y, m] = m === 12 ? [y + 1, 1] : [y, m + 1];
  }
  return out;
}

const pgArray = (values: readonly number[]) => `{${values.join(',')}}`;

// Each shop's period bounds in its own zone, as in the comparison.
const bounds = (ids: readonly number[], period: PeriodQuery) => sql`
  select x.id, x.time_zone,
    (${period.from}::date::timestamp at time zone x.time_zone) as t0,
    ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
  from shops x
  where x.id = any(${pgArray(ids)}::int[])`;

type Row = Record<string, string | number | null>;

async function monthlyRows(
  conn: Db,
  metric: TrendMetric,
  ids: readonly number[],
  period: PeriodQuery,
  asOf: Date,
): Promise<Row[]> {
  if (ids.length === 0) return [];
  if (metric === 'comebacks') {
    const settings = await loadSettings(conn);
    const at = asOf.toISOString();
    const hours = settings.warrantyDays * 24;
    const counted = `{${settings.countedAttributions.join(',')}}`;
    const closed = sql`j.collected_at + ${hours} * interval '1 hour' <= ${at}::timestamptz`;
    const month = sql`to_char(j.collected_at at time zone s.time_zone, 'YYYY-MM')`;
    // The same for a comeback, from the original job's collection time it carries.
    const backClosed = sql`cb.original_collected_at + ${hours} * interval '1 hour' <= ${at}::timestamptz`;
    const backMonth = sql`to_char(cb.original_collected_at at time zone s.time_zone, 'YYYY-MM')`;
    // As in the comparison: closed windows counted over the index, returns from the comebacks'
    // own index (no join to the jobs).
    const { rows } = await conn.execute<Row>(sql`
      with s as (${bounds(ids, period)})
      select s.id as "shopId", m.month, m.trials, m.events, m.open
      from s
      cross join lateral (
        select c.month, (c.closed + coalesce(b.open_came_back, 0))::int as trials,
          coalesce(b.events, 0)::int as events, (c.collected - c.closed)::int as open
        from (
          select ${month} as month, count(*) filter (where ${closed}) as closed,
            count(*) as collected
          from jobs j
          where j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1
            and j.collected_at <= ${at}::timestamptz
          group by 1
        ) c
        left join (
          select k.month,
            count(*) filter (where k.came_back and not k.closed) as open_came_back,
            count(*) filter (where k.counted) as events
          from (
            select ${backMonth} as month, ${backClosed} as closed,
              bool_or(cb.status = 'confirmed') as came_back,
              bool_or(cb.status = 'confirmed'
                and cb.attribution = any(${counted}::comeback_attribution[])) as counted
            from comebacks cb
            where cb.original_shop_id = s.id
              and cb.original_collected_at >= s.t0 and cb.original_collected_at < s.t1
              and cb.detected_at >= cb.original_collected_at
              and cb.detected_at < cb.original_collected_at + ${hours} * interval '1 hour'
              and cb.detected_at <= ${at}::timestamptz
            group by cb.original_job_id, cb.original_collected_at
          ) k
          group by k.month
        ) b on b.month = c.month
      ) m`);
    return rows;
  }
  if (metric === 'turnaround') {
    const { rows } = await conn.execute<Row>(sql`
      with s as (${bounds(ids, period)})
      select s.id as "shopId", m.*
      from s
      cross join lateral (
        select to_char(j.ready_at at time zone s.time_zone, 'YYYY-MM') as month,
          count(*)::int as count,
          percentile_cont(0.5) within group (order by j.customer_turnaround_minutes) as "customerMedian",
          percentile_cont(0.9) within group (order by j.customer_turnaround_minutes) as "customerP90",
          percentile_cont(0.5) within group (order by j.bench_turnaround_minutes) as "benchMedian",
          percentile_cont(0.9) within group (order by j.bench_turnaround_minutes) as "benchP90"
        from jobs j
        where j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1
        group by 1
      ) m`);
    return rows;
  }
  const { rows } = await conn.execute<Row>(sql`
    with s as (${bounds(ids, period)})
    select s.id as "shopId", m.*
    from s
    cross join lateral (
      select to_char(j.ready_at at time zone s.time_zone, 'YYYY-MM') as month,
        coalesce(sum(j.labour_cents + j.parts_cents - j.discount_cents), 0)::float8 as "revenueCents",
        coalesce(sum(j.labour_cents), 0)::float8 as "labourCents",
        coalesce(sum(j.bench_minutes), 0)::float8 as "benchMinutes"
      from jobs j
      where j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1
      group by 1
    ) m`);
  return rows;
}

const num = (v: string | number | null | undefined) => (v == null ? null : Number(v));

/**
 * A p-chart in which months with warranty windows still open are provisional: their rate counts
 * returns but not yet the jobs that will stay away, so it reads high. The centre line comes from
 * the final months only, and a provisional month is drawn against its limits but never signals.
 */
export function provisionalPChart(months: readonly (PChartPoint & { open: number })[]): {
  center: number | null;
  points: MonthlyComebackPoint[];
} {
  const final = months.filter((m) => m.open === 0);
  const chart = pChart(final);
  const byLabel = new Map(chart.points.map((p) => [p.label, p]));
  return {
    center: chart.center,
    points: months.map((m) => {
      const done = byLabel.get(m.label);
      if (done) return { ...done, open: 0, provisional: false };
      const limits =
        chart.center === null || m.trials === 0 ? null : pChartLimits(chart.center, m.trials);
      return {
        ...m,
        rate: m.trials === 0 ? null : m.events / m.trials,
        lower: limits?.lower ?? null,
        upper: limits?.upper ?? null,
        signal: null,
        provisional: true,
      };
    }),
  };
}

/** Monthly series for the given shops over the period's months, figures by @reelwright/metrics. */
async function trendsFor(
  conn: Db,
  shops: readonly NetworkShop[],
  metric: TrendMetric,
  period: PeriodQuery,
  asOf: Date,
): Promise<TrendsResult> {
  const months = monthsOf(period);
  const rows = await monthlyRows(
    conn,
    metric,
    shops.map((s) => s.id),
    period,
    asOf,
  );
  const byKey = new Map(rows.map((r) => [`${r.shopId}:${r.month}`, r]));
  const info = { ...period, asOf: asOf.toISOString() };
  const cell = (shop: NetworkShop, month: string) => byKey.get(`${shop.id}:${month}`);
  if (metric === 'comebacks') {
    return {
      metric,
      period: info,
      months,
      shops: shops.map((shop) => {
        const all = months.map((label) => {
          const r = cell(shop, label);
          return {
            label,
            events: Number(r?.events ?? 0),
            trials: Number(r?.trials ?? 0),
            open: Number(r?.open ?? 0),
          };
        });
        return { shop: toRef(shop), ...provisionalPChart(all) };
      }),
    };
  }
  if (metric === 'turnaround') {
    return {
      metric,
      period: info,
      months,
      shops: shops.map((shop) => ({
        shop: toRef(shop),
        points: months.map((label) => {
          const r = cell(shop, label);
          return {
            label,
            count: Number(r?.count ?? 0),
            customerMedian: num(r?.customerMedian),
            customerP90: num(r?.customerP90),
            benchMedian: num(r?.benchMedian),
            benchP90: num(r?.benchP90),
          };
        }),
      })),
    };
  }
  return {
    metric,
    period: info,
    months,
    shops: shops.map((shop) => ({
      shop: toRef(shop),
      points: months.map((label) => {
        const r = cell(shop, label);
        const revenueCents = Number(r?.revenueCents ?? 0);
        const labourCents = Number(r?.labourCents ?? 0);
        const benchMinutes = Number(r?.benchMinutes ?? 0);
        return {
          label,
          revenueCents,
          labourCents,
          benchMinutes,
          perBenchHourCents: revenuePerBenchHour([{ revenueCents, benchMinutes }]),
          realisation: rateRealisation([{ labourCents, benchMinutes }], shop.labourRateCents)
            .realisation,
        };
      }),
    })),
  };
}

/** `GET /api/network/trends`: monthly series for every shop in view (404 for a region outside it). */
export async function networkTrends(
  principal: Principal,
  query: NetworkTrendsQuery,
  ctx: QueryContext = {},
): Promise<TrendsResult> {
  const { conn, asOf } = await resolveContext(ctx);
  const shops = (await loadShops(conn, principal)).filter((s) => s.visible);
  if (query.region !== undefined && !shops.some((s) => s.region.id === query.region)) {
    throw notFound('region');
  }
  const shown =
    query.region === undefined ? shops : shops.filter((s) => s.region.id === query.region);
  return trendsFor(conn, shown, query.metric, { from: query.from, to: query.to }, asOf);
}

/** `GET /api/shops/{id}/trends`: one shop's monthly series; a shop outside the scope is not found. */
export async function shopTrends(
  principal: Principal,
  shopId: number,
  query: ShopTrendsQuery,
  ctx: QueryContext = {},
): Promise<TrendsResult> {
  const { conn, asOf } = await resolveContext(ctx);
  const shop = (await loadShops(conn, principal)).find((s) => s.id === shopId && s.visible);
  if (!shop) throw notFound('shop');
  return trendsFor(conn, [shop], query.metric, { from: query.from, to: query.to }, asOf);
}
