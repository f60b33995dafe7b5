import { sql, type Db } from '@reelwright/db';
import { quantile, rateRealisation, revenuePerBenchHour } from '@reelwright/metrics';
import { SERVICE_LABELS } from '~/lib/labels';
import type { PeriodQuery } from '~/lib/validators/network';
import { notFound } from '../../errors';
import type { Principal } from '../../principal';
import { computeNetwork } from './comparison';
import { resolveContext, type QueryContext } from './context';
import type { HistogramBin, OpenJob, RevenueGroup, ShopComeback, ShopMetricsResult } from './types';

type Row = Record<string, unknown>;

// Bin widths a reader can add up in their head, in business minutes (30 min … 2 days of hours).
const BIN_WIDTHS = [30, 60, 120, 180, 240, 360, 480, 600, 720, 960, 1440, 2880];
const MAX_BINS = 16;

/**
 * Histogram of customer and bench turnaround, in business minutes. The width is the smallest
 * round width that covers the 95th percentile of customer turnaround in at most 16 bins; longer
 * jobs share a last, open-ended bin so one slow reel does not flatten the rest.
 */
export function turnaroundHistogram(
  customer: readonly number[],
  bench: readonly number[],
): { binMinutes: number; bins: HistogramBin[] } {
  if (customer.length === 0 && bench.length === 0) return { binMinutes: 60, bins: [] };
  const reach = quantile(customer.length > 0 ? customer : bench, 0.95);
  const width = BIN_WIDTHS.find((w) => Math.ceil((reach + 1) / w) <= MAX_BINS) ?? 2880;
  const closed = Math.max(1, Math.ceil((reach + 1) / width));
  const bins: HistogramBin[] = Array.from({ length: closed }, (_, k) => ({
    from: k * width,
    to: (k + 1) * width,
    customer: 0,
    bench: 0,
  }));
  const tail: HistogramBin = { from: closed * width, to: null, customer: 0, bench: 0 };
  const place = (minutes: number, key: 'customer' | 'bench') => {
    const k = Math.floor(minutes / width);
    (k < closed ? bins[k]! : tail)[key] += 1;
  };
  for (const m of customer) place(m, 'customer');
  for (const m of bench) place(m, 'bench');
  if (tail.customer + tail.bench > 0) bins.push(tail);
  return { binMinutes: width, bins };
}

const bounds = (shopId: number, period: PeriodQuery) => sql`
  select x.id, x.time_zone,
    (${period.from}::date::timestamp at time zone x.time_zone) as t0,
    ((${period.to}::date + 1)::timestamp at time zone x.time_zone) as t1
  from shops x where x.id = ${shopId}`;

async function turnaroundValues(conn: Db, shopId: number, period: PeriodQuery) {
  const { rows } = await conn.execute<{ c: number | null; b: number | null }>(sql`
    with s as (${bounds(shopId, period)})
    select j.customer_turnaround_minutes as c, j.bench_turnaround_minutes as b
    from s join jobs j on j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1`);
  const customer: number[] = [];
  const bench: number[] = [];
  for (const r of rows) {
    if (r.c != null) customer.push(Number(r.c));
    if (r.b != null) bench.push(Number(r.b));
  }
  return { customer, bench };
}

async function periodComebacks(
  conn: Db,
  shopId: number,
  period: PeriodQuery,
  asOf: Date,
  settings: { warrantyDays: number; countedAttributions: readonly string[] },
): Promise<ShopComeback[]> {
  const hours = settings.warrantyDays * 24;
  const at = asOf.toISOString();
  const { rows } = await conn.execute<Row>(sql`
    with s as (${bounds(shopId, period)})
    select cb.id, cb.job_id as "jobId", cb.original_job_id as "originalJobId",
      j.collected_at as "collectedAt", cb.detected_at as "detectedAt",
      cb.days_since_collection as "daysSinceCollection", cb.symptom, cb.status::text as status,
      cb.attribution::text as attribution, rc.label as "rootCause",
      cb.disposition::text as disposition,
      (cb.detected_at >= j.collected_at
        and cb.detected_at < j.collected_at + ${hours} * interval '1 hour') as "inWindow"
    from s
    join jobs j on j.shop_id = s.id and j.collected_at >= s.t0 and j.collected_at < s.t1
      and j.collected_at <= ${at}::timestamptz
    join comebacks cb on cb.original_job_id = j.id and cb.detected_at <= ${at}::timestamptz
    left join root_causes rc on rc.id = cb.root_cause_id
    order by cb.detected_at desc, cb.id desc`);
  const counted = new Set(settings.countedAttributions);
  return rows.map((r) => ({
    id: Number(r.id),
    jobId: Number(r.jobId),
    originalJobId: Number(r.originalJobId),
    collectedAt: new Date(r.collectedAt as string | Date).toISOString(),
    detectedAt: new Date(r.detectedAt as string | Date).toISOString(),
    daysSinceCollection: Number(r.daysSinceCollection),
    symptom: (r.symptom as string | null) ?? null,
    status: r.status as ShopComeback['status'],
    attribution: (r.attribution as ShopComeback['attribution']) ?? null,
    rootCause: (r.rootCause as string | null) ?? null,
    disposition: (r.disposition as string | null) ?? null,
    counted:
      r.inWindow === true &&
      r.status === 'confirmed' &&
      r.attribution != null &&
      counted.has(r.attribution as string),
  }));
}

async function revenueGroups(
  conn: Db,
  shopId: number,
  period: PeriodQuery,
  labourRateCents: number,
  by: 'technician' | 'service',
): Promise<RevenueGroup[]> {
  const key =
    by === 'technician' ? sql`coalesce(j.technician_id::text, '')` : sql`j.service_type::text`;
  const label = by === 'technician' ? sql`max(u.name)` : sql`null`;
  const { rows } = await conn.execute<Row>(sql`
    with s as (${bounds(shopId, period)})
    select ${key} as key, ${label} as label, count(*)::int as jobs,
      coalesce(sum(j.labour_cents + j.parts_cents - j.discount_cents), 0)::float8 as "revenueCents",
      coalesce(sum(j.labour_cents), 0)::float8 as "labourCents",
      coalesce(sum(j.bench_minutes), 0)::float8 as "benchMinutes"
    from s
    join jobs j on j.shop_id = s.id and j.ready_at >= s.t0 and j.ready_at < s.t1
    left join users u on u.id = j.technician_id
    group by 1
    order by 1`);
  return rows
    .map((r) => {
      const revenueCents = Number(r.revenueCents);
      const labourCents = Number(r.labourCents);
      const benchMinutes = Number(r.benchMinutes);
      const k = String(r.key);
      return {
        key: k,
        label:
          by === 'service'
            ? (SERVICE_LABELS[k as keyof typeof SERVICE_LABELS] ?? k)
            : ((r.label as string | null) ?? 'No technician recorded'),
        jobs: Number(r.jobs),
        revenueCents,
        labourCents,
        benchMinutes,
        perBenchHourCents: revenuePerBenchHour([{ revenueCents, benchMinutes }]),
        realisation: rateRealisation([{ labourCents, benchMinutes }], labourRateCents).realisation,
      };
    })
    .sort((a, b) => b.revenueCents - a.revenueCents);
}

async function openWork(conn: Db, shopId: number, asOf: Date) {
  const { rows: counts } = await conn.execute<{ state: OpenJob['state']; n: number }>(sql`
    select state::text as state, count(*)::int as n from jobs
    where shop_id = ${shopId} and state in ('checked_in', 'on_bench', 'waiting_parts', 'ready')
    group by 1`);
  const { rows } = await conn.execute<Row>(sql`
    select j.id, j.state::text as state, j.service_type::text as "serviceType",
      j.checked_in_at as "checkedInAt", j.promised_at as "promisedAt",
      c.name as "customerName", r.maker, r.model, u.name as "technicianName"
    from jobs j
    join customers c on c.id = j.customer_id
    join reels r on r.id = j.reel_id
    left join users u on u.id = j.technician_id
    where j.shop_id = ${shopId} and j.state in ('checked_in', 'on_bench', 'waiting_parts')
    order by j.checked_in_at asc, j.id asc
    limit 10`);
  const openCounts: ShopMetricsResult['openCounts'] = {
    checked_in: 0,
    on_bench: 0,
    waiting_parts: 0,
    ready: 0,
  };
  for (const c of counts) openCounts[c.state] = Number(c.n);
  const openLongest = rows.map((r): OpenJob => {
    const checkedInAt = new Date(r.checkedInAt as string | Date);
    return {
      id: Number(r.id),
      state: r.state as OpenJob['state'],
      serviceType: String(r.serviceType),
      checkedInAt: checkedInAt.toISOString(),
      promisedAt: r.promisedAt ? new Date(r.promisedAt as string | Date).toISOString() : null,
      customerName: String(r.customerName),
      reel: `${String(r.maker)} ${String(r.model)}`,
      technicianName: (r.technicianName as string | null) ?? null,
      daysOpen: Math.max(0, Math.floor((asOf.getTime() - checkedInAt.getTime()) / 86_400_000)),
    };
  });
  return { openCounts, openLongest };
}

/**
 * `GET /api/shops/{id}/metrics`: one shop's figures for the period, judged against the whole
 * network, with its turnaround histogram, the comebacks of jobs collected in the period, revenue
 * per bench hour by technician (a technician: their own row only) and by service, and its open
 * work. Outside the scope: not found.
 */
export async function shopMetrics(
  principal: Principal,
  shopId: number,
  period: PeriodQuery,
  ctx: QueryContext = {},
): Promise<ShopMetricsResult> {
  const { conn, asOf } = await resolveContext(ctx);
  const net = await computeNetwork(conn, principal, period, asOf, {
    referenceCache: ctx.referenceCache,
  });
  const index = net.shops.findIndex((s) => s.id === shopId && s.visible);
  if (index < 0) throw notFound('shop');
  const figures = net.figures[index]!;
  const rate = figures.shop.labourRateCents;
  const [values, comebacks, allTechnicians, byServiceType, open] = await Promise.all([
    turnaroundValues(conn, shopId, period),
    periodComebacks(conn, shopId, period, asOf, net.settings),
    revenueGroups(conn, shopId, period, rate, 'technician'),
    revenueGroups(conn, shopId, period, rate, 'service'),
    openWork(conn, shopId, asOf),
  ]);
  const ownTechnicianOnly = principal.role === 'technician';
  const byTechnician = ownTechnicianOnly
    ? allTechnicians.filter((g) => g.key === String(principal.id))
    : allTechnicians;
  return {
    period: { ...period, asOf: asOf.toISOString() },
    settings: net.settings,
    reference: net.reference,
    network: net.network,
    figures,
    histogram: turnaroundHistogram(values.customer, values.bench),
    comebacks,
    byTechnician,
    ownTechnicianOnly,
    byServiceType,
    ...open,
  };
}
