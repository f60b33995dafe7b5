import {
  and,
  asc,
  eq,
  gte,
  inArray,
  isNull,
  lt,
  ne,
  or,
  sql,
  type Db,
  type SQL,
} from '@reelwright/db';
import {
  comebacks,
  correctiveActions,
  jobs,
  networkSettings,
  regions,
  shops,
} from '@reelwright/db/schema';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import {
  shopFigures,
  TotalsAccumulator,
  type Figures,
  type MonthComeback,
  type MonthJob,
  type PooledTurnaround,
  type RateSettings,
  type ShopFigures,
  type ShopRef,
  type TotalsFigures,
  type Turnaround,
} from './figures';
import type { Principal } from '../principal';
import { auditSummaryByShop } from '../queries/audits';
import { openDuring } from '../queries/scope';
import { loadReference } from '../queries/network/reference';
import { monthDates } from './period';

/** Shops per round trip: bounds memory, so 500 shops cost no more at a time than 25. */
export const BATCH_SIZE = 25;

export interface NetworkRules extends RateSettings {
  currency: string;
}

/**
 * Warranty window, counted attributions and currency from the owner's settings; given a month,
 * also the network's reference curve of the months before it (as the network view uses), so
 * that the month's observed comebacks can be set against those expected.
 */
export async function networkRules(conn: Db, asOf: Date, month?: string): Promise<NetworkRules> {
  const [row] = await conn.select().from(networkSettings).where(eq(networkSettings.id, 1));
  const rules = {
    asOf,
    warrantyDays: row?.warrantyDays ?? 90,
    countedAttributions: row?.countedAttributions ?? ['workmanship', 'part_failure'],
    currency: row?.currency ?? 'USD',
  };
  if (!month) return rules;
  const { first, last } = monthDates(month);
  const loaded = await loadReference(conn, { from: first, to: last }, asOf, {
    ...rules,
    referenceMonths: row?.comebackReferenceMonths ?? 12,
  });
  return { ...rules, reference: loaded.reference };
}

/** The shops a scope condition selects, region by region and by name (the export's order). */
export async function shopsIn(
  conn: Db,
  where: SQL | undefined,
  month?: string,
): Promise<ShopRef[]> {
  const open = month ? openDuring(monthDates(month).first, monthDates(month).last) : undefined;
  return conn
    .select({
      id: shops.id,
      name: shops.name,
      regionId: shops.regionId,
      regionName: regions.name,
      timeZone: shops.timeZone,
      // The rate dated for the month (shop_royalty_rates), else the shop's own.
      royaltyRateBp: month
        ? sql<number>`coalesce((select r.royalty_rate_bp from shop_royalty_rates r
            where r.shop_id = "shops"."id" and r.from_month <= ${month}
            order by r.from_month desc limit 1), "shops"."royalty_rate_bp")`.mapWith(Number)
        : shops.royaltyRateBp,
    })
    .from(shops)
    .innerJoin(regions, eq(regions.id, shops.regionId))
    .where(and(where, open))
    .orderBy(asc(regions.name), asc(shops.name), asc(shops.id));
}

/** SQL bounds of the month in the zone of the shop in the query: [start, end). */
function bounds(month: string) {
  const { first, nextFirst } = monthDates(month);
  const start = sql`((${first})::date::timestamp at time zone ${shops.timeZone})`;
  const end = sql`((${nextFirst})::date::timestamp at time zone ${shops.timeZone})`;
  const within = (column: AnyPgColumn) =>
    sql<boolean>`(${column} >= ${start} and ${column} < ${end})`;
  return { start, end, within };
}

export type AuditsByShop = ReadonlyMap<number, Figures['audits']>;

/**
 * The month's audit figures per shop as the Audits section counts them (`auditSummaryByShop`):
 * rounds whose period ends in the month (the shop's local dates), lots rejected, and scored samples
 * that did not meet the standard.
 */
export async function auditsByShop(principal: Principal, month: string): Promise<AuditsByShop> {
  const { first, last } = monthDates(month);
  const rows = await auditSummaryByShop(principal, { from: first, to: last });
  return new Map(
    rows.map((r) => [
      r.shopId,
      {
        rounds: r.roundsAccepted + r.roundsRejected,
        rejected: r.roundsRejected,
        failures: r.failures,
      },
    ]),
  );
}

/** Figures for each shop, yielded in order, a batch of shops per round of queries. */
export async function* streamShopFigures(
  conn: Db,
  shopList: readonly ShopRef[],
  month: string,
  rules: RateSettings,
  audits: AuditsByShop,
  batchSize = BATCH_SIZE,
): AsyncGenerator<ShopFigures> {
  const { first, last } = monthDates(month);
  const { end, within } = bounds(month);
  for (let i = 0; i < shopList.length; i += batchSize) {
    const batch = shopList.slice(i, i + batchSize);
    const ids = batch.map((s) => s.id);
    const collectedIds = conn
      .select({ id: jobs.id })
      .from(jobs)
      .innerJoin(shops, eq(shops.id, jobs.shopId))
      .where(and(inArray(jobs.shopId, ids), within(jobs.collectedAt)));
    const [jobRows, comebackRows, actionRows] = await Promise.all([
      conn
        .select({
          shopId: jobs.shopId,
          id: jobs.id,
          checkedInInMonth: within(jobs.checkedInAt),
          readyInMonth: sql<boolean>`coalesce(${within(jobs.readyAt)}, false)`,
          collectedInMonth: sql<boolean>`coalesce(${within(jobs.collectedAt)}, false)`,
          promisedAt: jobs.promisedAt,
          readyAt: jobs.readyAt,
          collectedAt: jobs.collectedAt,
          labourCents: jobs.labourCents,
          partsCents: jobs.partsCents,
          discountCents: jobs.discountCents,
          benchMinutes: jobs.benchMinutes,
          customerTurnaroundMinutes: jobs.customerTurnaroundMinutes,
          benchTurnaroundMinutes: jobs.benchTurnaroundMinutes,
        })
        .from(jobs)
        .innerJoin(shops, eq(shops.id, jobs.shopId))
        .where(
          and(
            inArray(jobs.shopId, ids),
            or(within(jobs.checkedInAt), within(jobs.readyAt), within(jobs.collectedAt)),
          ),
        ),
      conn
        .select({
          originalJobId: comebacks.originalJobId,
          attribution: comebacks.attribution,
          detectedAt: comebacks.detectedAt,
        })
        .from(comebacks)
        .where(
          and(ne(comebacks.status, 'dismissed'), inArray(comebacks.originalJobId, collectedIds)),
        ),
      conn
        .select({
          shopId: correctiveActions.shopId,
          open: sql<number>`count(*)`.mapWith(Number),
        })
        .from(correctiveActions)
        .innerJoin(shops, eq(shops.id, correctiveActions.shopId))
        .where(
          and(
            inArray(correctiveActions.shopId, ids),
            lt(correctiveActions.createdAt, end),
            or(
              and(
                isNull(correctiveActions.doneAt),
                inArray(correctiveActions.status, ['open', 'in_progress']),
              ),
              gte(correctiveActions.doneAt, end),
            ),
          ),
        )
        .groupBy(correctiveActions.shopId),
    ]);
    const jobsByShop = group(jobRows, (r) => r.shopId);
    const shopOfJob = new Map(jobRows.map((r) => [r.id, r.shopId]));
    const comebacksByShop = group(comebackRows, (r) => shopOfJob.get(r.originalJobId) ?? -1);
    const actions = new Map(actionRows.map((r) => [r.shopId, r.open]));
    for (const shop of batch) {
      const audit = audits.get(shop.id);
      const figures = shopFigures({
        jobs: (jobsByShop.get(shop.id) ?? []) as MonthJob[],
        comebacks: (comebacksByShop.get(shop.id) ?? []) as MonthComeback[],
        audits: {
          rounds: audit?.rounds ?? 0,
          rejected: audit?.rejected ?? 0,
          failures: audit?.failures ?? 0,
        },
        openCorrectiveActions: actions.get(shop.id) ?? 0,
        royaltyRateBp: shop.royaltyRateBp,
        settings: rules,
      });
      yield { shop, periodStart: first, periodEnd: last, ...figures };
    }
  }
}

function group<T>(rows: readonly T[], key: (row: T) => number): Map<number, T[]> {
  const out = new Map<number, T[]>();
  for (const row of rows) {
    const k = key(row);
    const list = out.get(k);
    if (list) list.push(row);
    else out.set(k, [row]);
  }
  return out;
}

const EMPTY: Turnaround = { count: 0, medianMinutes: null, p90Minutes: null };

/**
 * Median and 90th percentile of the pooled turnaround minutes of the jobs that became ready in the
 * month, over all the given shops and per region. PostgreSQL's percentile_cont interpolates
 * between order statistics exactly as Hyndman & Fan type 7, the definition turnaroundSummary uses.
 */
export async function pooledTurnaround(
  conn: Db,
  shopIds: readonly number[],
  month: string,
): Promise<{ all: PooledTurnaround; byRegion: Map<number, PooledTurnaround> }> {
  const empty = { customer: EMPTY, bench: EMPTY };
  if (!shopIds.length) return { all: empty, byRegion: new Map() };
  const { within } = bounds(month);
  const quantiles = (column: AnyPgColumn) => ({
    count: sql<number>`count(${column})`.mapWith(Number),
    median: sql<number | null>`percentile_cont(0.5) within group (order by ${column})`.mapWith(
      (v: unknown) => (v === null ? null : Number(v)),
    ),
    p90: sql<number | null>`percentile_cont(0.9) within group (order by ${column})`.mapWith(
      (v: unknown) => (v === null ? null : Number(v)),
    ),
  });
  const c = quantiles(jobs.customerTurnaroundMinutes);
  const b = quantiles(jobs.benchTurnaroundMinutes);
  const rows = await conn
    .select({
      regionId: shops.regionId,
      total: sql<number>`grouping(${shops.regionId})`.mapWith(Number),
      cCount: c.count,
      cMedian: c.median,
      cP90: c.p90,
      bCount: b.count,
      bMedian: b.median,
      bP90: b.p90,
    })
    .from(jobs)
    .innerJoin(shops, eq(shops.id, jobs.shopId))
    .where(and(inArray(jobs.shopId, [...shopIds]), within(jobs.readyAt)))
    .groupBy(sql`grouping sets ((), (${shops.regionId}))`);
  const toPooled = (r: (typeof rows)[number]): PooledTurnaround => ({
    customer: { count: r.cCount, medianMinutes: r.cMedian, p90Minutes: r.cP90 },
    bench: { count: r.bCount, medianMinutes: r.bMedian, p90Minutes: r.bP90 },
  });
  const byRegion = new Map<number, PooledTurnaround>();
  let all = empty;
  for (const r of rows) {
    if (r.total === 1) all = toPooled(r);
    else byRegion.set(r.regionId, toPooled(r));
  }
  return { all, byRegion };
}

export interface FrozenFigures {
  version: 1;
  month: string;
  asOf: string;
  currency: string;
  warrantyDays: number;
  countedAttributions: readonly string[];
  shops: ShopFigures[];
  totals: { network: TotalsFigures; regions: Record<string, TotalsFigures> };
}

/** Every shop of the network and the totals for the network and each region: what a close freezes. */
export async function computeNetwork(
  conn: Db,
  month: string,
  rules: NetworkRules,
  audits: AuditsByShop,
): Promise<FrozenFigures> {
  const shopList = await shopsIn(conn, undefined, month);
  const network = new TotalsAccumulator('All shops', rules);
  const regionTotals = new Map<number, TotalsAccumulator>();
  const rows: ShopFigures[] = [];
  for await (const row of streamShopFigures(conn, shopList, month, rules, audits)) {
    rows.push(row);
    network.add(row);
    let acc = regionTotals.get(row.shop.regionId);
    if (!acc)
      regionTotals.set(
        row.shop.regionId,
        (acc = new TotalsAccumulator(row.shop.regionName, rules)),
      );
    acc.add(row);
  }
  const pooled = await pooledTurnaround(
    conn,
    shopList.map((s) => s.id),
    month,
  );
  const empty = { customer: EMPTY, bench: EMPTY };
  return {
    version: 1,
    month,
    asOf: rules.asOf.toISOString(),
    currency: rules.currency,
    warrantyDays: rules.warrantyDays,
    countedAttributions: rules.countedAttributions,
    shops: rows,
    totals: {
      network: network.finish(pooled.all),
      regions: Object.fromEntries(
        [...regionTotals].map(([id, acc]) => [
          String(id),
          acc.finish(pooled.byRegion.get(id) ?? empty),
        ]),
      ),
    },
  };
}

export type { Figures };
