import { sql, type Db } from '@reelwright/db';
import {
  comebackEstimate,
  pChart,
  rateRealisation,
  revenuePerBenchHour,
  tableTotals,
  type ComebackEstimate,
  type ComebackReference,
  type PChartPoint,
  type SurvivalTable,
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
import { emptyTable, followUpTables } from './follow-up';
import { loadReference } from './reference';
import type { MonthlyComebackPoint, MonthlyComebacks, TrendsResult } from './types';

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
  metric: Exclude<TrendMetric, 'comebacks'>,
  ids: readonly number[],
  period: PeriodQuery,
): Promise<Row[]> {
  if (ids.length === 0) return [];
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

/** One month of the trend with its follow-up figures (`comebackEstimate`). */
export interface MonthEstimate {
  label: string;
  estimate: ComebackEstimate;
}

/**
 * A shop's months: each its comeback estimate with its 95% interval. A month in which no job is
 * still being followed is final (the estimate is events ÷ jobs) and joins a p-chart around the
 * shop's own rate over its final months, with 3-sigma limits for its volume. A month with jobs
 * still inside their window is an estimate: drawn with its own interval, never given limits or a
 * signal, since limits for its whole volume would be narrower than its follow-up supports.
 */
export function comebackTrendPoints(months: readonly MonthEstimate[]): {
  center: number | null;
  points: MonthlyComebackPoint[];
} {
  const row = (m: MonthEstimate): PChartPoint => ({
    label: m.label,
    events: m.estimate.events,
    trials: m.estimate.jobs,
  });
  const chart = pChart(months.filter((m) => m.estimate.final).map(row));
  const byLabel = new Map(chart.points.map((p) => [p.label, p]));
  return {
    center: chart.center,
    points: months.map(({ label, estimate: e }): MonthlyComebackPoint => {
      const base = {
        label,
        events: e.events,
        trials: e.jobs,
        method: e.method,
        interval: e.interval,
        stillFollowed: e.stillFollowed,
        followedThrough: e.followedThrough,
      };
      const done = e.final ? byLabel.get(label) : undefined;
      if (done) return { ...base, ...done, provisional: false };
      return {
        ...base,
        rate: e.probability,
        lower: null,
        upper: null,
        signal: null,
        provisional: true,
      };
    }),
  };
}

/** The month `label` ("YYYY-MM") cut to the period. */
function monthWithin(label: string, period: PeriodQuery): PeriodQuery {
  const [y, m] = label.split('-').map(Number) as [number, number];
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  const from = `${label}-01`;
  const to = `${label}-${String(last).padStart(2, '0')}`;
  return { from: from < period.from ? period.from : from, to: to > period.to ? period.to : to };
}

/**
 * Each shop's monthly comeback estimates from the follow-up tables the comparison uses, grouped by
 * the shop's local month of collection (closed months from shop_month_figures, open ones from the
 * jobs' index). A month in which no job has been followed through the window yet is estimated as
 * the comparison estimates it for that month: the network curve of the twelve months before it,
 * carried by the month's observed ÷ expected comebacks (its reference is loaded only then, and
 * kept as the comparison keeps it).
 */
async function comebackTrend(
  conn: Db,
  shops: readonly NetworkShop[],
  period: PeriodQuery,
  asOf: Date,
  referenceCache?: boolean,
): Promise<{ warrantyDays: number; shops: MonthlyComebacks[] }> {
  const months = monthsOf(period);
  const settings = await loadSettings(conn);
  const w = settings.warrantyDays;
  const tables =
    shops.length === 0
      ? new Map<string, SurvivalTable>()
      : await followUpTables(
          conn,
          shops.map((s) => s.id),
          period,
          asOf,
          settings,
          { byMonth: true },
        );
  const table = (shop: NetworkShop, label: string) =>
    tables.get(`${shop.id}:${label}`) ?? emptyTable(w);
  const references = new Map<string, ComebackReference | null>();
  await Promise.all(
    months
      .filter((label) =>
        shops.some((shop) => {
          const t = tableTotals(table(shop, label), w);
          return t.jobs > 0 && t.followedThrough === 0 && t.censoredBefore > 0;
        }),
      )
      .map(async (label) => {
        const loaded = await loadReference(conn, monthWithin(label, period), asOf, settings, {
          cache: referenceCache,
        });
        references.set(label, loaded.reference);
      }),
  );
  return {
    warrantyDays: w,
    shops: shops.map((shop) => ({
      shop: toRef(shop),
      ...comebackTrendPoints(
        months.map((label) => ({
          label,
          estimate: comebackEstimate(table(shop, label), {
            warrantyDays: w,
            reference: references.get(label) ?? null,
          }),
        })),
      ),
    })),
  };
}

/** Monthly series for the given shops over the period's months, figures by @reelwright/metrics. */
async function trendsFor(
  conn: Db,
  shops: readonly NetworkShop[],
  metric: TrendMetric,
  period: PeriodQuery,
  asOf: Date,
  referenceCache?: boolean,
): Promise<TrendsResult> {
  const months = monthsOf(period);
  const info = { ...period, asOf: asOf.toISOString() };
  if (metric === 'comebacks') {
    return {
      metric,
      period: info,
      months,
      ...(await comebackTrend(conn, shops, period, asOf, referenceCache)),
    };
  }
  const rows = await monthlyRows(
    conn,
    metric,
    shops.map((s) => s.id),
    period,
  );
  const byKey = new Map(rows.map((r) => [`${r.shopId}:${r.month}`, r]));
  const cell = (shop: NetworkShop, month: string) => byKey.get(`${shop.id}:${month}`);
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
  return trendsFor(
    conn,
    shown,
    query.metric,
    { from: query.from, to: query.to },
    asOf,
    ctx.referenceCache,
  );
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
  return trendsFor(
    conn,
    [shop],
    query.metric,
    { from: query.from, to: query.to },
    asOf,
    ctx.referenceCache,
  );
}
