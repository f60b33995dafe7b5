import type { ShopFigures, TotalsFigures } from './figures';

/** What every row of one export shares. */
export interface CsvContext {
  month: string;
  status: 'open' | 'closed';
  /** The instant warranty windows are judged at (the close, or the moment of a live export). */
  asOf: string;
  currency: string;
  periodStart: string;
  periodEnd: string;
}

export type CsvRow =
  | { kind: 'shop'; figures: ShopFigures; invoiceStatus: string | null }
  | { kind: 'total'; figures: TotalsFigures };

type Cell = { text: string | null } | { number: string | null };

/** Integer cents as a decimal amount, exactly: -1234 → "-12.34". */
export function money(cents: number | null): string | null {
  if (cents === null) return null;
  const abs = Math.abs(cents);
  return `${cents < 0 ? '-' : ''}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
}

const fixed = (value: number | null, decimals: number) =>
  value === null || !Number.isFinite(value) ? null : value.toFixed(decimals);
const hours = (minutes: number | null) => fixed(minutes === null ? null : minutes / 60, 2);
const int = (value: number) => String(value);

const text = (value: string | null): Cell => ({ text: value });
const num = (value: string | null): Cell => ({ number: value });

interface Column {
  name: string;
  cell: (row: CsvRow, ctx: CsvContext) => Cell;
}

const shopOf = (row: CsvRow) => (row.kind === 'shop' ? row.figures.shop : null);
const est = (row: CsvRow) => row.figures.comebackEstimate;
// A month frozen before the estimate existed keeps its rate as it was computed then.
const final = (row: CsvRow) => est(row)?.final ?? true;

/** The documented column set, in order (README: "Month-close CSV"). */
export const CSV_COLUMNS: readonly Column[] = [
  { name: 'row_type', cell: (r) => text(r.kind) },
  { name: 'month', cell: (_, c) => text(c.month) },
  {
    name: 'period_start',
    cell: (r, c) => text(r.kind === 'shop' ? r.figures.periodStart : c.periodStart),
  },
  {
    name: 'period_end',
    cell: (r, c) => text(r.kind === 'shop' ? r.figures.periodEnd : c.periodEnd),
  },
  { name: 'status', cell: (_, c) => text(c.status) },
  { name: 'as_of', cell: (_, c) => text(c.asOf) },
  { name: 'region', cell: (r) => text(shopOf(r)?.regionName ?? null) },
  { name: 'shop_id', cell: (r) => num(shopOf(r) ? int(shopOf(r)!.id) : null) },
  {
    name: 'shop',
    cell: (r) =>
      text(r.kind === 'shop' ? r.figures.shop.name : `${r.figures.label} (${r.figures.shops})`),
  },
  { name: 'time_zone', cell: (r) => text(shopOf(r)?.timeZone ?? null) },
  { name: 'jobs_checked_in', cell: (r) => num(int(r.figures.jobs.checkedIn)) },
  { name: 'jobs_ready', cell: (r) => num(int(r.figures.jobs.ready)) },
  { name: 'jobs_collected', cell: (r) => num(int(r.figures.jobs.collected)) },
  { name: 'currency', cell: (_, c) => text(c.currency) },
  { name: 'labour', cell: (r) => num(money(r.figures.money.labourCents)) },
  { name: 'parts', cell: (r) => num(money(r.figures.money.partsCents)) },
  { name: 'discounts', cell: (r) => num(money(r.figures.money.discountCents)) },
  { name: 'billed_revenue', cell: (r) => num(money(r.figures.money.billedCents)) },
  { name: 'bench_hours', cell: (r) => num(hours(r.figures.benchMinutes)) },
  { name: 'revenue_per_bench_hour', cell: (r) => num(money(r.figures.revenuePerBenchHourCents)) },
  { name: 'customer_turnaround_jobs', cell: (r) => num(int(r.figures.customerTurnaround.count)) },
  {
    name: 'customer_turnaround_median_hours',
    cell: (r) => num(hours(r.figures.customerTurnaround.medianMinutes)),
  },
  {
    name: 'customer_turnaround_p90_hours',
    cell: (r) => num(hours(r.figures.customerTurnaround.p90Minutes)),
  },
  {
    name: 'bench_turnaround_median_hours',
    cell: (r) => num(hours(r.figures.benchTurnaround.medianMinutes)),
  },
  {
    name: 'bench_turnaround_p90_hours',
    cell: (r) => num(hours(r.figures.benchTurnaround.p90Minutes)),
  },
  { name: 'on_time_jobs', cell: (r) => num(int(r.figures.onTime.onTime)) },
  { name: 'promised_jobs', cell: (r) => num(int(r.figures.onTime.total)) },
  { name: 'on_time_share', cell: (r) => num(fixed(r.figures.onTime.share, 4)) },
  // The final rate: empty while any window of the month is open (the estimate below stands in).
  { name: 'comebacks', cell: (r) => num(final(r) ? int(r.figures.comebacks.events) : null) },
  { name: 'comeback_trials', cell: (r) => num(final(r) ? int(r.figures.comebacks.trials) : null) },
  { name: 'comeback_rate', cell: (r) => num(final(r) ? fixed(r.figures.comebacks.rate, 4) : null) },
  {
    name: 'comeback_rate_low_95',
    cell: (r) => num(final(r) ? fixed(r.figures.comebacks.lower, 4) : null),
  },
  {
    name: 'comeback_rate_high_95',
    cell: (r) => num(final(r) ? fixed(r.figures.comebacks.upper, 4) : null),
  },
  { name: 'comeback_estimate', cell: (r) => num(fixed(est(r)?.probability ?? null, 4)) },
  { name: 'comeback_estimate_low_95', cell: (r) => num(fixed(est(r)?.lower ?? null, 4)) },
  { name: 'comeback_estimate_high_95', cell: (r) => num(fixed(est(r)?.upper ?? null, 4)) },
  { name: 'comebacks_observed', cell: (r) => num(est(r) ? int(est(r)!.observed) : null) },
  { name: 'comebacks_expected', cell: (r) => num(fixed(est(r)?.expected ?? null, 2)) },
  { name: 'comeback_ratio', cell: (r) => num(fixed(est(r)?.ratio ?? null, 3)) },
  { name: 'jobs_still_followed', cell: (r) => num(est(r) ? int(est(r)!.stillFollowed) : null) },
  { name: 'audit_rounds', cell: (r) => num(int(r.figures.audits.rounds)) },
  { name: 'audit_rounds_rejected', cell: (r) => num(int(r.figures.audits.rejected)) },
  { name: 'audit_failures', cell: (r) => num(int(r.figures.audits.failures)) },
  { name: 'open_corrective_actions', cell: (r) => num(int(r.figures.openCorrectiveActions)) },
  {
    name: 'royalty_rate_percent',
    cell: (r) =>
      num(r.figures.royaltyRateBp === null ? null : fixed(r.figures.royaltyRateBp / 100, 2)),
  },
  { name: 'royalty_due', cell: (r) => num(money(r.figures.royaltyCents)) },
  { name: 'invoice_status', cell: (r) => text(r.kind === 'shop' ? r.invoiceStatus : null) },
];

/**
 * A text cell made safe for spreadsheets (OWASP "CSV Injection"): one that would start with
 * `=`, `+`, `-`, `@`, a tab or a carriage return gets a leading single quote, so it is shown as
 * text and never run as a formula. Number cells are written by us from numbers and are left alone,
 * so a negative amount stays a number.
 */
export function neutralise(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** RFC 4180 quoting: only fields holding a quote, comma, CR or LF are quoted; quotes doubled. */
export function quote(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

function encode(cell: Cell): string {
  if ('number' in cell) return cell.number ?? '';
  return cell.text === null ? '' : quote(neutralise(cell.text));
}

const CRLF = '\r\n';

export function csvHeader(): string {
  return CSV_COLUMNS.map((c) => c.name).join(',') + CRLF;
}

export function csvLine(row: CsvRow, ctx: CsvContext): string {
  return CSV_COLUMNS.map((c) => encode(c.cell(row, ctx))).join(',') + CRLF;
}

/**
 * The export as a byte stream: the header, then a row each time the consumer asks for more (rows
 * are computed as they are pulled, a batch of shops at a time), then the totals row.
 */
export function csvStream(
  rows: AsyncIterable<CsvRow>,
  ctx: CsvContext,
  totals: () => Promise<CsvRow>,
): ReadableStream<Uint8Array> {
  const encoder = new TextEncoder();
  const iterator = rows[Symbol.asyncIterator]();
  let headerSent = false;
  let done = false;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        if (!headerSent) {
          headerSent = true;
          controller.enqueue(encoder.encode(csvHeader()));
          return;
        }
        if (done) return;
        const next = await iterator.next();
        if (!next.done) {
          controller.enqueue(encoder.encode(csvLine(next.value, ctx)));
          return;
        }
        done = true;
        controller.enqueue(encoder.encode(csvLine(await totals(), ctx)));
        controller.close();
      } catch (error) {
        controller.error(error);
      }
    },
    async cancel() {
      await iterator.return?.(undefined);
    },
  });
}
