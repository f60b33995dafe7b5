import { and, desc, eq, inArray, isNull, sql, type Db } from '@reelwright/db';
import { alias } from 'drizzle-orm/pg-core';
import {
  monthCloses,
  royaltyInvoices,
  shops,
  users,
  type RoyaltyInvoiceStatus,
} from '@reelwright/db/schema';
import { db } from '../db';
import {
  auditsByShop,
  networkRules,
  pooledTurnaround,
  shopsIn,
  streamShopFigures,
  type FrozenFigures,
} from '../month-close/compute';
import { csvStream, type CsvContext, type CsvRow } from '../month-close/csv';
import {
  TotalsAccumulator,
  type Figures,
  type RateSettings,
  type ShopFigures,
  type ShopRef,
  type TotalsFigures,
} from '../month-close/figures';
import { monthDates, monthLabel } from '../month-close/period';
import type { Principal } from '../principal';
import { shopScope } from './scope';
import * as clock from '~/server/clock';

export interface InvoiceSummary {
  status: RoyaltyInvoiceStatus;
  amountCents: number;
  currency: string;
  stripeInvoiceId: string | null;
  hostedInvoiceUrl: string | null;
  issuedAt: Date | null;
  paidAt: Date | null;
  failedAt: Date | null;
  lastError: string | null;
}

export interface MonthCloseShopRow extends ShopFigures {
  invoice: InvoiceSummary | null;
}

export interface CloseRecord {
  id: number;
  closedAt: Date;
  closedBy: string | null;
  reopenedAt: Date | null;
  reopenedBy: string | null;
  reopenReason: string | null;
}

/** A figure of a closed month that no longer matches the live data. */
export interface Difference {
  shopId: number;
  shopName: string;
  field: string;
  label: string;
  frozen: number | null;
  live: number | null;
}

export interface MonthCloseReport {
  month: string;
  label: string;
  currency: string;
  status: 'open' | 'closed';
  /** Whether the month has ended in every shop of the network (a close needs it). */
  ended: boolean;
  /** Warranty windows are judged at this instant: the close, or now for an open month. */
  asOf: string;
  warrantyDays: number;
  countedAttributions: readonly string[];
  close: CloseRecord | null;
  /** Every close of the month, newest first (reopened ones with their reason). */
  history: CloseRecord[];
  shops: MonthCloseShopRow[];
  totals: TotalsFigures;
  /** Closed months only: frozen figures that differ from the live data at the same as-of. */
  differences: Difference[] | null;
  /**
   * The owner's latest request to issue the month's royalty invoices, which a queue job carries
   * out shop by shop; `doneAt` is null while it runs (the page follows the invoices arriving).
   */
  invoicing: { requestedAt: Date; doneAt: Date | null } | null;
}

const closedBy = alias(users, 'closed_by');
const reopenedBy = alias(users, 'reopened_by');

export async function closeHistory(conn: Db, month: string): Promise<CloseRecord[]> {
  return conn
    .select({
      id: monthCloses.id,
      closedAt: monthCloses.closedAt,
      closedBy: closedBy.name,
      reopenedAt: monthCloses.reopenedAt,
      reopenedBy: reopenedBy.name,
      reopenReason: monthCloses.reopenReason,
    })
    .from(monthCloses)
    .leftJoin(closedBy, eq(closedBy.id, monthCloses.closedById))
    .leftJoin(reopenedBy, eq(reopenedBy.id, monthCloses.reopenedById))
    .where(eq(monthCloses.month, month))
    .orderBy(desc(monthCloses.closedAt), desc(monthCloses.id));
}

/** The month's standing close (not reopened), with its frozen figures. */
export async function currentClose(conn: Db, month: string) {
  const [row] = await conn
    .select()
    .from(monthCloses)
    .where(and(eq(monthCloses.month, month), isNull(monthCloses.reopenedAt)));
  return row ? { ...row, figures: row.figures as unknown as FrozenFigures } : null;
}

/** True once the month is over in the zone of every shop (the last zone west decides). */
export async function monthEnded(conn: Db, month: string, now: Date): Promise<boolean> {
  const { nextFirst } = monthDates(month);
  const { rows } = await conn.execute<{ ended: boolean | null }>(
    sql`select bool_and(${now.toISOString()}::timestamptz >= ((${nextFirst})::date::timestamp at time zone ${shops.timeZone})) as ended from ${shops}`,
  );
  return rows[0]?.ended === true;
}

async function invoicesFor(conn: Db, month: string, shopIds: number[]) {
  if (!shopIds.length) return new Map<number, InvoiceSummary>();
  const rows = await conn
    .select()
    .from(royaltyInvoices)
    .where(and(eq(royaltyInvoices.month, month), inArray(royaltyInvoices.shopId, shopIds)));
  return new Map(
    rows.map((r) => [
      r.shopId,
      {
        status: r.status,
        amountCents: r.amountCents,
        currency: r.currency,
        stripeInvoiceId: r.stripeInvoiceId,
        hostedInvoiceUrl: r.hostedInvoiceUrl,
        issuedAt: r.issuedAt,
        paidAt: r.paidAt,
        failedAt: r.failedAt,
        lastError: r.lastError,
      } satisfies InvoiceSummary,
    ]),
  );
}

function scopeLabel(principal: Principal, scoped: ShopRef[]): string {
  if (principal.scope.kind === 'network') return 'All shops';
  return scoped[0]?.regionName ?? 'Your shops';
}

/** Live totals of the given shop rows, with turnaround quantiles pooled in the database. */
async function liveTotals(
  conn: Db,
  label: string,
  rows: Figures[],
  shopIds: number[],
  month: string,
  rules?: RateSettings,
) {
  const acc = new TotalsAccumulator(label, rules);
  for (const row of rows) acc.add(row);
  return acc.finish((await pooledTurnaround(conn, shopIds, month)).all);
}

async function collect<T>(source: AsyncIterable<T>): Promise<T[]> {
  const out: T[] = [];
  for await (const item of source) out.push(item);
  return out;
}

/** Totals for the caller from a frozen close: the network's, or their region's. */
function frozenTotals(principal: Principal, frozen: FrozenFigures, label: string): TotalsFigures {
  if (principal.scope.kind === 'network') return frozen.totals.network;
  const regionId = principal.scope.kind === 'region' ? principal.scope.regionId : null;
  const totals = regionId === null ? undefined : frozen.totals.regions[String(regionId)];
  return (
    totals ??
    new TotalsAccumulator(label).finish({
      customer: { count: 0, medianMinutes: null, p90Minutes: null },
      bench: { count: 0, medianMinutes: null, p90Minutes: null },
    })
  );
}

const COMPARED: { field: string; label: string; get: (f: Figures) => number | null }[] = [
  { field: 'jobs.checkedIn', label: 'Jobs checked in', get: (f) => f.jobs.checkedIn },
  { field: 'jobs.ready', label: 'Jobs ready', get: (f) => f.jobs.ready },
  { field: 'jobs.collected', label: 'Jobs collected', get: (f) => f.jobs.collected },
  { field: 'money.labourCents', label: 'Labour', get: (f) => f.money.labourCents },
  { field: 'money.partsCents', label: 'Parts', get: (f) => f.money.partsCents },
  { field: 'money.discountCents', label: 'Discounts', get: (f) => f.money.discountCents },
  { field: 'money.billedCents', label: 'Billed revenue', get: (f) => f.money.billedCents },
  { field: 'benchMinutes', label: 'Bench minutes', get: (f) => f.benchMinutes },
  {
    field: 'customerTurnaround.medianMinutes',
    label: 'Customer turnaround median',
    get: (f) => f.customerTurnaround.medianMinutes,
  },
  {
    field: 'customerTurnaround.p90Minutes',
    label: 'Customer turnaround p90',
    get: (f) => f.customerTurnaround.p90Minutes,
  },
  {
    field: 'benchTurnaround.medianMinutes',
    label: 'Bench turnaround median',
    get: (f) => f.benchTurnaround.medianMinutes,
  },
  {
    field: 'benchTurnaround.p90Minutes',
    label: 'Bench turnaround p90',
    get: (f) => f.benchTurnaround.p90Minutes,
  },
  { field: 'onTime.onTime', label: 'Jobs ready on time', get: (f) => f.onTime.onTime },
  { field: 'comebacks.events', label: 'Comebacks', get: (f) => f.comebacks.events },
  { field: 'comebacks.trials', label: 'Jobs judged for comebacks', get: (f) => f.comebacks.trials },
  { field: 'audits.rounds', label: 'Audit rounds', get: (f) => f.audits.rounds },
  { field: 'audits.failures', label: 'Audit failures', get: (f) => f.audits.failures },
  {
    field: 'openCorrectiveActions',
    label: 'Open corrective actions',
    get: (f) => f.openCorrectiveActions,
  },
  { field: 'royaltyRateBp', label: 'Royalty rate (bp)', get: (f) => f.royaltyRateBp },
  { field: 'royaltyCents', label: 'Royalty due', get: (f) => f.royaltyCents },
];

function differences(frozen: ShopFigures[], live: ShopFigures[]): Difference[] {
  const liveById = new Map(live.map((r) => [r.shop.id, r]));
  const out: Difference[] = [];
  for (const f of frozen) {
    const l = liveById.get(f.shop.id);
    if (!l) continue;
    for (const c of COMPARED) {
      const a = c.get(f);
      const b = c.get(l);
      if (a === b || (a !== null && b !== null && Math.abs(a - b) < 1e-9)) continue;
      out.push({
        shopId: f.shop.id,
        shopName: f.shop.name,
        field: c.field,
        label: c.label,
        frozen: a,
        live: b,
      });
    }
  }
  return out;
}

/**
 * The month-close table for the caller's shops (the owner's network, a manager's region): frozen
 * figures when the month is closed (with what has changed since), live figures otherwise, each
 * shop with its royalty invoice.
 */
export async function getMonthClose(
  principal: Principal,
  month: string,
  options: { now?: Date } = {},
): Promise<MonthCloseReport> {
  const now = options.now ?? clock.now();
  const conn = await db();
  const scoped = await shopsIn(conn, shopScope(principal), month);
  const ids = scoped.map((s) => s.id);
  const label = scopeLabel(principal, scoped);
  const [history, close, ended, invoices] = await Promise.all([
    closeHistory(conn, month),
    currentClose(conn, month),
    monthEnded(conn, month, now),
    invoicesFor(conn, month, ids),
  ]);
  const withInvoice = (row: ShopFigures): MonthCloseShopRow => ({
    ...row,
    invoice: invoices.get(row.shop.id) ?? null,
  });
  const base = {
    month,
    label: monthLabel(month),
    ended,
    history,
    close: history.find((h) => h.id === close?.id) ?? null,
  };
  if (close) {
    const frozen = close.figures;
    const inScope = new Set(ids);
    const frozenRows = frozen.shops.filter((r) => inScope.has(r.shop.id));
    const rules = await networkRules(conn, new Date(frozen.asOf), month);
    const audits = await auditsByShop(principal, month);
    const live = await collect(
      streamShopFigures(
        conn,
        scoped.filter((s) => frozenRows.some((r) => r.shop.id === s.id)),
        month,
        rules,
        audits,
      ),
    );
    return {
      ...base,
      status: 'closed',
      currency: frozen.currency,
      asOf: frozen.asOf,
      warrantyDays: frozen.warrantyDays,
      countedAttributions: frozen.countedAttributions,
      shops: frozenRows.map(withInvoice),
      totals: frozenTotals(principal, frozen, label),
      differences: differences(frozenRows, live),
      invoicing: close.invoicesRequestedAt
        ? { requestedAt: close.invoicesRequestedAt, doneAt: close.invoicesDoneAt }
        : null,
    };
  }
  const rules = await networkRules(conn, now, month);
  const rows = await collect(
    streamShopFigures(conn, scoped, month, rules, await auditsByShop(principal, month)),
  );
  return {
    ...base,
    status: 'open',
    currency: rules.currency,
    asOf: now.toISOString(),
    warrantyDays: rules.warrantyDays,
    countedAttributions: rules.countedAttributions,
    shops: rows.map(withInvoice),
    totals: await liveTotals(conn, label, rows, ids, month, rules),
    differences: null,
    invoicing: null,
  };
}

/** Frozen shop rows read from the stored close a page at a time, so no export holds them all. */
async function* frozenRows(conn: Db, closeId: number, shopIds: Set<number>, page = 100) {
  for (let offset = 0; ; offset += page) {
    const { rows } = await conn.execute<{ row: ShopFigures }>(
      sql`select e.row from ${monthCloses}, jsonb_array_elements(${monthCloses.figures} -> 'shops') with ordinality as e(row, n)
          where ${monthCloses.id} = ${closeId} order by e.n offset ${offset} limit ${page}`,
    );
    for (const { row } of rows) if (shopIds.has(row.shop.id)) yield row;
    if (rows.length < page) return;
  }
}

/**
 * The CSV export of the month for the caller's shops, streamed: each row is computed (or read from
 * the frozen close) as the response is consumed, then the totals row.
 */
export async function monthCloseCsv(
  principal: Principal,
  month: string,
  options: { now?: Date } = {},
): Promise<{ filename: string; stream: ReadableStream<Uint8Array> }> {
  const now = options.now ?? clock.now();
  const conn = await db();
  const scoped = await shopsIn(conn, shopScope(principal), month);
  const ids = scoped.map((s) => s.id);
  const label = scopeLabel(principal, scoped);
  const [close, invoices] = await Promise.all([
    currentClose(conn, month),
    invoicesFor(conn, month, ids),
  ]);
  const { first, last } = monthDates(month);
  const scopeSuffix = principal.scope.kind === 'network' ? '' : `-${slug(label)}`;
  const filename = `reelwright-month-close-${month}${scopeSuffix}.csv`;
  const toRow = (figures: ShopFigures): CsvRow => ({
    kind: 'shop',
    figures,
    invoiceStatus: invoices.get(figures.shop.id)?.status ?? null,
  });
  if (close) {
    const frozen = close.figures;
    const ctx: CsvContext = {
      month,
      status: 'closed',
      asOf: frozen.asOf,
      currency: frozen.currency,
      periodStart: first,
      periodEnd: last,
    };
    const rows = mapAsync(frozenRows(conn, close.id, new Set(ids)), toRow);
    return {
      filename,
      stream: csvStream(rows, ctx, async () => ({
        kind: 'total',
        figures: frozenTotals(principal, frozen, label),
      })),
    };
  }
  const rules = await networkRules(conn, now, month);
  const acc = new TotalsAccumulator(label, rules);
  const ctx: CsvContext = {
    month,
    status: 'open',
    asOf: now.toISOString(),
    currency: rules.currency,
    periodStart: first,
    periodEnd: last,
  };
  const audits = await auditsByShop(principal, month);
  const rows = mapAsync(streamShopFigures(conn, scoped, month, rules, audits), (f) => {
    acc.add(f);
    return toRow(f);
  });
  return {
    filename,
    stream: csvStream(rows, ctx, async () => ({
      kind: 'total',
      figures: acc.finish((await pooledTurnaround(conn, ids, month)).all),
    })),
  };
}

async function* mapAsync<T, U>(source: AsyncIterable<T>, fn: (value: T) => U): AsyncGenerator<U> {
  for await (const value of source) yield fn(value);
}

const slug = (value: string) =>
  value
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '');

/** Months with a close record, newest first, for the month picker. */
export async function closedMonths(): Promise<{ month: string; closed: boolean }[]> {
  const conn = await db();
  const rows = await conn
    .select({
      month: monthCloses.month,
      closed: sql<boolean>`bool_or(${monthCloses.reopenedAt} is null)`,
    })
    .from(monthCloses)
    .groupBy(monthCloses.month)
    .orderBy(desc(monthCloses.month));
  return rows;
}
