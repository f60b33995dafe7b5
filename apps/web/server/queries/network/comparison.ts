import { asc, sql, type Db, type SQL } from '@reelwright/db';
import { regions as regionsTable } from '@reelwright/db/schema';
import { summariseSortedRuns, type SurvivalTable } from '@reelwright/metrics';
import type { ComparisonQuery, PeriodQuery } from '~/lib/validators/network';
import { addDays, shopSeverities } from '../../audits/sampling';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import {
  loadSettings,
  loadShops,
  resolveContext,
  type NetworkSettingsUsed,
  type NetworkShop,
  type QueryContext,
} from './context';
import { assembleFigures, totals } from './assemble';
import { emptyTable, followUpTables, periodIsFinal } from './follow-up';
import { loadReference } from './reference';
import type { NetworkComparisonResult } from './types';

/** One shop's counts for a period, straight from the aggregate. */
export interface ShopCounts {
  shopId: number;
  jobsReady: number;
  customerN: number;
  customerTotal: number;
  customerMedian: number | null;
  customerP90: number | null;
  benchN: number;
  benchTotal: number;
  benchMedian: number | null;
  benchP90: number | null;
  waitingMinutes: number;
  promised: number;
  onTime: number;
  revenueCents: number;
  labourCents: number;
  benchMinutes: number;
  collected: number;
  trials: number;
  events: number;
  awaitingReview: number;
  auditRounds: number;
  auditScored: number;
  auditFailures: number;
  auditCritical: number;
  /** Sum of the scores of scored samples (the average is this ÷ auditScored). */
  auditScoreSum: number;
  auditAccepted: number;
  auditRejected: number;
  actionsOpen: number;
  actionsOverdue: number;
}

const pgArray = (values: readonly (string | number)[]) => `{${values.join(',')}}`;

/**
 * The whole months of a period, [first, end) as first days of months; both are the day after the
 * period when it holds no whole month.
 */
export function wholeMonths(period: PeriodQuery): { first: string; end: string } {
  const after = addDays(period.to, 1);
  const first = period.from.endsWith('-01')
    ? period.from
    : `${addMonths(period.from.slice(0, 7))}-01`;
  const end = `${after.slice(0, 7)}-01`;
  return first < end ? { first, end } : { first: after, end: after };
}

/** "YYYY-MM" of the next month. */
function addMonths(month: string): string {
  const [y, m] = month.split('-').map(Number) as [number, number];
  return new Date(Date.UTC(y, m, 1)).toISOString().slice(0, 7);
}

/**
 * The SQL behind the comparison: per shop, the jobs that became ready in the period (counts,
 * sums, on-time, money, bench time and every turnaround), the jobs collected in it and those of
 * them that came back (trials and events of the comeback rate), audit samples of rounds ending in
 * it, and open corrective actions. The period is [from, to + 1 day) in each shop's own zone.
 *
 * The period's whole months come from shop_month_figures, the monthly sums the database keeps
 * equal to the jobs table (migration 0003): one row per shop and month instead of every job; the
 * days before the first and after the last whole month are summed from the jobs by
 * shop_ready_figures, the function that fills those rows. The turnarounds are kept whole and
 * ascending, so the medians and 90th percentiles (Hyndman & Fan type 7, as the metrics engine)
 * are taken here over exactly the period's jobs by merging those few sorted runs.
 *
 * Trials are the collected jobs whose warranty window has closed plus those still inside it that
 * came back. A whole month ending on or before the start of the month in which asOf less the
 * window falls is closed, and its collections are its row's; the others are counted from the
 * (shop, collected_at, id) index, each compared with that instant. The comebacks are read from
 * their own index, which carries the original job's collection time. The warranty window is whole
 * 24-hour days as in the metrics engine (an interval in days would follow the session zone's
 * daylight-saving changes). Each part is a lateral subquery per shop so that it reads the
 * (shop, …) indexes whatever the planner's statistics say.
 */
export async function aggregateShops(
  conn: Db,
  /** Null for every shop of the network. */
  shopIds: readonly number[] | null,
  period: PeriodQuery,
  asOf: Date,
  settings: NetworkSettingsUsed,
): Promise<Map<number, ShopCounts>> {
  if (shopIds?.length === 0) return new Map();
  const at = asOf.toISOString();
  const hours = settings.warrantyDays * 24;
  const window = `${hours} hours`;
  const closedBy = new Date(asOf.getTime() - hours * 3_600_000).toISOString();
  const counted = pgArray(settings.countedAttributions);
  const { first, end } = wholeMonths(period);
  // The days outside whole months are read from the jobs, and so are the collections of whole
  // months whose warranty windows may not all have closed in every shop's zone (the month is
  // taken 14 hours behind UTC, more than any zone lags); a past month, quarter or season reads
  // neither.
  const rawStart = period.from < first;
  const rawEnd = end < addDays(period.to, 1);
  const closedMonth = `${new Date(Date.parse(closedBy) - 14 * 3_600_000).toISOString().slice(0, 7)}-01`;
  const rawTail = rawEnd || end > closedMonth;
  const readyRanges = [
    ...(rawStart ? [sql`select * from shop_ready_figures(s.id, s.t0, s.m0)`] : []),
    ...(rawEnd ? [sql`select * from shop_ready_figures(s.id, s.m1, s.t1)`] : []),
  ];
  const collectedRanges = [
    ...(rawStart
      ? [
          sql`select j.collected_at from jobs j
          where j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.m0`,
        ]
      : []),
    ...(rawTail
      ? [
          sql`select j.collected_at from jobs j
          where j.shop_id = s.id and j.collected_at >= s.c1 and j.collected_at < s.t1`,
        ]
      : []),
  ];
  const unionAll = (parts: SQL[]) => sql.join(parts, sql` union all `);
  const shopsInPeriod = sql`
    with s as (
      select x.id,
        (${period.from}::date::timestamp at time zone x.time_zone) as t0,
        ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1,
        (${first}::date::timestamp at time zone x.time_zone) as m0,
        (${end}::date::timestamp at time zone x.time_zone) as m1,
        m.closed_end, (m.closed_end::timestamp at time zone x.time_zone) as c1,
        (${at}::timestamptz at time zone x.time_zone)::date as today
      from shops x
      cross join lateral (
        select greatest(${first}::date, least(${end}::date,
          date_trunc('month', ${closedBy}::timestamptz at time zone x.time_zone)::date)) as closed_end
      ) m
      ${shopIds ? sql`where x.id = any(${pgArray(shopIds)}::int[])` : sql``}
    )`;
  type Row = Record<string, number | string | null>;
  // Two statements, so that PostgreSQL runs them side by side on two connections (PGlite, with
  // one, runs them in turn): the ready and collected jobs, and everything else.
  const [jobsRows, rest] = await Promise.all([
    conn.execute<Row>(sql`
    ${shopsInPeriod}
    select s.id as "shopId",
      r.jobs_ready as "jobsReady",
      r.customer_n as "customerN", r.customer_total as "customerTotal",
      r.customer_minutes as "customerMinutes",
      r.bench_n as "benchN", r.bench_total as "benchTotal",
      r.bench_turnarounds as "benchTurnarounds",
      r.waiting_minutes as "waitingMinutes", r.promised, r.on_time as "onTime",
      r.revenue_cents as "revenueCents", r.labour_cents as "labourCents",
      r.bench_minutes as "benchMinutes",
      c.months + c.collected as collected, c.months + c.closed as closed
    from s
    cross join lateral (
      select coalesce(sum(u.jobs_ready), 0)::int as jobs_ready,
        coalesce(sum(u.customer_n), 0)::int as customer_n,
        coalesce(sum(u.customer_total), 0)::float8 as customer_total,
        string_agg(nullif(u.customer_minutes, ''), '|') as customer_minutes,
        coalesce(sum(u.bench_n), 0)::int as bench_n,
        coalesce(sum(u.bench_total), 0)::float8 as bench_total,
        string_agg(nullif(u.bench_turnarounds, ''), '|') as bench_turnarounds,
        coalesce(sum(u.waiting_minutes), 0)::float8 as waiting_minutes,
        coalesce(sum(u.promised), 0)::int as promised,
        coalesce(sum(u.on_time), 0)::int as on_time,
        coalesce(sum(u.revenue_cents), 0)::float8 as revenue_cents,
        coalesce(sum(u.labour_cents), 0)::float8 as labour_cents,
        coalesce(sum(u.bench_minutes), 0)::float8 as bench_minutes
      from (
        select m.jobs_ready, m.customer_n, m.customer_total, m.customer_minutes, m.bench_n,
          m.bench_total, m.bench_turnarounds, m.waiting_minutes, m.promised, m.on_time,
          m.revenue_cents, m.labour_cents, m.bench_minutes
        from shop_month_figures m
        where m.shop_id = s.id and m.month >= ${first}::date and m.month < ${end}::date
        ${readyRanges.length > 0 ? sql`union all ${unionAll(readyRanges)}` : sql``}
      ) u
    ) r
    cross join lateral (
      select coalesce(sum(m.collected), 0)::int as months
      from shop_month_figures m
      where m.shop_id = s.id and m.month >= ${first}::date and m.month < s.closed_end
    ) cm
    cross join lateral (
      select cm.months, count(*)::int as collected,
        (count(*) filter (where j.collected_at <= ${closedBy}::timestamptz))::int as closed
      from (${
        collectedRanges.length > 0
          ? unionAll(collectedRanges)
          : sql`select null::timestamptz as collected_at where false`
      }) j
      where j.collected_at <= ${at}::timestamptz
    ) c
  `),
    conn.execute<Row>(sql`
    ${shopsInPeriod}
    select s.id as "shopId",
      b.open_came_back as "openCameBack", b.events, b.awaiting_review as "awaitingReview",
      a.rounds as "auditRounds", a.scored as "auditScored", a.failures as "auditFailures",
      a.critical as "auditCritical", a.score_sum as "auditScoreSum",
      a.accepted as "auditAccepted", a.rejected as "auditRejected",
      ca.open as "actionsOpen", ca.overdue as "actionsOverdue"
    from s
    cross join lateral (
      select (count(*) filter (where k.came_back and not k.closed))::int as open_came_back,
        (count(*) filter (where k.counted))::int as events,
        (count(*) filter (where k.pending and not k.came_back))::int as awaiting_review
      from (
        select cb.original_collected_at <= ${closedBy}::timestamptz as closed,
          bool_or(cb.status = 'confirmed') as came_back,
          bool_or(cb.status = 'confirmed'
            and cb.attribution = any(${counted}::comeback_attribution[])) as counted,
          bool_or(cb.status = 'open') as pending
        from comebacks cb
        where cb.original_shop_id = s.id
          and cb.original_collected_at >= s.t0 and cb.original_collected_at < s.t1
          and cb.detected_at >= cb.original_collected_at
          and cb.detected_at < cb.original_collected_at + ${window}::interval
          and cb.detected_at <= ${at}::timestamptz
        group by cb.original_job_id, cb.original_collected_at
      ) k
    ) b
    cross join lateral (
      select count(distinct ar.id)::int as rounds,
        count(sm.verdict)::int as scored,
        (count(*) filter (where sm.verdict in ('needs_work', 'critical_miss')))::int as failures,
        (count(*) filter (where sm.verdict = 'critical_miss'))::int as critical,
        coalesce(sum(sm.score) filter (where sm.verdict is not null), 0)::float8 as score_sum,
        (count(distinct ar.id) filter (where ar.decision = 'accepted'))::int as accepted,
        (count(distinct ar.id) filter (where ar.decision = 'rejected'))::int as rejected
      from audit_rounds ar
      left join audit_samples sm on sm.round_id = ar.id
      where ar.shop_id = s.id and ar.status <> 'cancelled'
        and ar.period_end >= ${period.from}::date and ar.period_end <= ${period.to}::date
    ) a
    cross join lateral (
      select (count(*) filter (where x.status in ('open', 'in_progress')))::int as open,
        (count(*) filter (where x.status in ('open', 'in_progress') and x.due_on < s.today))::int
          as overdue
      from corrective_actions x
      where x.shop_id = s.id
    ) ca
  `),
  ]);
  const restById = new Map(rest.rows.map((r) => [Number(r.shopId), r]));
  const out = new Map<number, ShopCounts>();
  for (const counts of jobsRows.rows) {
    const row = { ...restById.get(Number(counts.shopId)), ...counts };
    const n = (key: string) => Number(row[key] ?? 0);
    const customer = summariseSortedRuns(row.customerMinutes as string | null);
    const bench = summariseSortedRuns(row.benchTurnarounds as string | null);
    out.set(n('shopId'), {
      shopId: n('shopId'),
      jobsReady: n('jobsReady'),
      customerN: n('customerN'),
      customerTotal: n('customerTotal'),
      customerMedian: customer.median,
      customerP90: customer.p90,
      benchN: n('benchN'),
      benchTotal: n('benchTotal'),
      benchMedian: bench.median,
      benchP90: bench.p90,
      waitingMinutes: n('waitingMinutes'),
      promised: n('promised'),
      onTime: n('onTime'),
      revenueCents: n('revenueCents'),
      labourCents: n('labourCents'),
      benchMinutes: n('benchMinutes'),
      collected: n('collected'),
      trials: n('closed') + n('openCameBack'),
      events: n('events'),
      awaitingReview: n('awaitingReview'),
      auditRounds: n('auditRounds'),
      auditScored: n('auditScored'),
      auditFailures: n('auditFailures'),
      auditCritical: n('auditCritical'),
      auditScoreSum: n('auditScoreSum'),
      auditAccepted: n('auditAccepted'),
      auditRejected: n('auditRejected'),
      actionsOpen: n('actionsOpen'),
      actionsOverdue: n('actionsOverdue'),
    });
  }
  return out;
}

/** Every region, by name. */
function loadRegions(conn: Db) {
  return conn
    .select({ id: regionsTable.id, name: regionsTable.name })
    .from(regionsTable)
    .orderBy(asc(regionsTable.name));
}

/** The regions the caller may filter by: all for the network, their own for a region or shop. */
function regionsFor(
  all: readonly { id: number; name: string }[],
  principal: Principal,
  shops: readonly NetworkShop[],
) {
  if (principal.scope.kind === 'network') return [...all];
  const mine = new Set(shops.filter((s) => s.visible).map((s) => s.region.id));
  if (principal.scope.kind === 'region') mine.add(principal.scope.regionId);
  return all.filter((r) => mine.has(r.id));
}

/**
 * The follow-up tables of a final period without another read: every job was followed through
 * the window or came back inside it, so Kaplan–Meier gives events / jobs and Greenwood's variance
 * telescopes to the binomial one whatever the days of the events; the events are put on day 1.
 */
function finalTables(counts: ReadonlyMap<number, ShopCounts>, warrantyDays: number) {
  const out = new Map<string, SurvivalTable>();
  for (const c of counts.values()) {
    const table = emptyTable(warrantyDays);
    table.events[1]! += c.events;
    table.censored[warrantyDays]! += c.collected - c.events;
    out.set(String(c.shopId), table);
  }
  return out;
}

/**
 * Loads and computes every shop's figures; shared by the network view and the shop page. The
 * reads go out together (PostgreSQL serves them on separate connections): the aggregate and the
 * severities cover every shop of the network, as the shop list does.
 */
export async function computeNetwork(
  conn: Db,
  principal: Principal,
  period: PeriodQuery,
  asOf: Date,
  options: { referenceCache?: boolean } = {},
) {
  const settingsRead = loadSettings(conn);
  const [settings, shops, counts, severities, tables, reference] = await Promise.all([
    settingsRead,
    loadShops(conn, principal, period),
    settingsRead.then((used) => aggregateShops(conn, null, period, asOf, used)),
    shopSeverities(conn, null),
    settingsRead.then((used) =>
      periodIsFinal(period, asOf, used.warrantyDays)
        ? null
        : followUpTables(conn, null, period, asOf, used),
    ),
    // A final period keeps the binomial comparison: no reference needed.
    settingsRead.then((used) =>
      periodIsFinal(period, asOf, used.warrantyDays)
        ? null
        : loadReference(conn, period, asOf, used, { cache: options.referenceCache }),
    ),
  ]);
  const final = periodIsFinal(period, asOf, settings.warrantyDays);
  const comebacks = {
    tables: tables ?? finalTables(counts, settings.warrantyDays),
    options: {
      warrantyDays: settings.warrantyDays,
      final,
      reference: reference?.reference ?? null,
    },
  };
  return {
    settings,
    shops,
    comebacks,
    reference:
      reference?.reference == null
        ? null
        : {
            ...reference.period,
            jobs: reference.jobs,
            probability: reference.reference.probability,
          },
    ...assembleFigures(shops, counts, severities, comebacks),
  };
}

/**
 * `GET /api/network/comparison`: per shop in the caller's scope (narrowed to a region if asked),
 * the counts behind every figure, the figures, intervals and bands, with totals for the shops
 * shown and for the whole network whose rate they are judged against. A region outside the
 * caller's scope is not found.
 */
export async function networkComparison(
  principal: Principal,
  query: ComparisonQuery,
  ctx: QueryContext = {},
): Promise<NetworkComparisonResult> {
  const { conn, asOf } = await resolveContext(ctx);
  const period = { from: query.from, to: query.to };
  const [net, allRegions] = await Promise.all([
    computeNetwork(conn, principal, period, asOf, { referenceCache: ctx.referenceCache }),
    loadRegions(conn),
  ]);
  const regions = regionsFor(allRegions, principal, net.shops);
  let region: { id: number; name: string } | null = null;
  if (query.region !== undefined) {
    region = regions.find((r) => r.id === query.region) ?? null;
    if (!region) throw notFound('region');
  }
  const shown = net.figures.filter(
    (_, i) => net.shops[i]!.visible && (region === null || net.shops[i]!.region.id === region.id),
  );
  return {
    period: { ...period, asOf: asOf.toISOString() },
    settings: net.settings,
    reference: net.reference,
    region,
    regions,
    network: net.network,
    view: totals(shown, net.comebacks),
    shops: shown,
  };
}
