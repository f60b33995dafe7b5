import { eq } from '@reelwright/db';
import { jobs } from '@reelwright/db/schema';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { closeMemoryDb, openMemoryDb, testState as state } from '~/server/testing/memory-db';
import { getMonthClose, monthCloseCsv, type MonthCloseReport } from '../queries/month-close';
import { closeMonth, reopenMonth } from './close';
import { CSV_COLUMNS, csvLine, neutralise, quote } from './csv';
import type { TotalsFigures } from './figures';
import { buildMonthCloseNetwork } from './test-network';

vi.mock('~/server/db', () => import('~/server/testing/memory-db').then((m) => m.dbModule));

let net: Awaited<ReturnType<typeof buildMonthCloseNetwork>>;
const MONTH = '2026-11';
/** Shortly after November ended everywhere. */
const NOW = new Date('2026-12-02T12:00:00Z');

beforeAll(async () => {
  await openMemoryDb();
  net = await buildMonthCloseNetwork(state.handle!.db);
}, 60_000);

afterAll(async () => {
  await closeMemoryDb();
});

async function csvOf(...args: Parameters<typeof monthCloseCsv>) {
  const { stream, filename } = await monthCloseCsv(...args);
  return { text: await new Response(stream).text(), filename };
}

function parse(text: string) {
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  return parsed;
}

const cents = (value: string) => Math.round(Number(value) * 100);
const dec = (value: number | null, digits: number) => (value === null ? '' : value.toFixed(digits));
const hrs = (minutes: number | null) => (minutes === null ? '' : (minutes / 60).toFixed(2));
const amount = (c: number | null) => (c === null ? '' : (c / 100).toFixed(2));

/** What the CSV row of a JSON row must read, written out independently of the encoder. */
function expectedRecord(
  report: MonthCloseReport,
  row: MonthCloseReport['shops'][number] | TotalsFigures,
): Record<string, string> {
  const isShop = 'shop' in row;
  const e = row.comebackEstimate;
  const final = e?.final ?? true;
  return {
    row_type: isShop ? 'shop' : 'total',
    month: report.month,
    period_start: isShop ? row.periodStart : '2026-11-01',
    period_end: isShop ? row.periodEnd : '2026-11-30',
    status: report.status,
    as_of: report.asOf,
    region: isShop ? row.shop.regionName : '',
    shop_id: isShop ? String(row.shop.id) : '',
    shop: isShop
      ? row.shop.name.startsWith('=')
        ? `'${row.shop.name}`
        : row.shop.name
      : `${row.label} (${row.shops})`,
    time_zone: isShop ? row.shop.timeZone : '',
    jobs_checked_in: String(row.jobs.checkedIn),
    jobs_ready: String(row.jobs.ready),
    jobs_collected: String(row.jobs.collected),
    currency: report.currency,
    labour: amount(row.money.labourCents),
    parts: amount(row.money.partsCents),
    discounts: amount(row.money.discountCents),
    billed_revenue: amount(row.money.billedCents),
    bench_hours: hrs(row.benchMinutes),
    revenue_per_bench_hour: amount(row.revenuePerBenchHourCents),
    customer_turnaround_jobs: String(row.customerTurnaround.count),
    customer_turnaround_median_hours: hrs(row.customerTurnaround.medianMinutes),
    customer_turnaround_p90_hours: hrs(row.customerTurnaround.p90Minutes),
    bench_turnaround_median_hours: hrs(row.benchTurnaround.medianMinutes),
    bench_turnaround_p90_hours: hrs(row.benchTurnaround.p90Minutes),
    on_time_jobs: String(row.onTime.onTime),
    promised_jobs: String(row.onTime.total),
    on_time_share: dec(row.onTime.share, 4),
    // The final-rate columns stay empty until every window of the month has closed.
    comebacks: final ? String(row.comebacks.events) : '',
    comeback_trials: final ? String(row.comebacks.trials) : '',
    comeback_rate: final ? dec(row.comebacks.rate, 4) : '',
    comeback_rate_low_95: final ? dec(row.comebacks.lower, 4) : '',
    comeback_rate_high_95: final ? dec(row.comebacks.upper, 4) : '',
    comeback_estimate: dec(e!.probability, 4),
    comeback_estimate_low_95: dec(e!.lower, 4),
    comeback_estimate_high_95: dec(e!.upper, 4),
    comebacks_observed: String(e!.observed),
    comebacks_expected: dec(e!.expected, 2),
    comeback_ratio: dec(e!.ratio, 3),
    jobs_still_followed: String(e!.stillFollowed),
    audit_rounds: String(row.audits.rounds),
    audit_rounds_rejected: String(row.audits.rejected),
    audit_failures: String(row.audits.failures),
    open_corrective_actions: String(row.openCorrectiveActions),
    royalty_rate_percent: row.royaltyRateBp === null ? '' : (row.royaltyRateBp / 100).toFixed(2),
    royalty_due: amount(row.royaltyCents),
    invoice_status: isShop ? (row.invoice?.status ?? '') : '',
  };
}

describe('month close – figures', () => {
  it('owner – sees every shop with November taken in its own time zone', async () => {
    const report = await getMonthClose(net.owner, MONTH, { now: NOW });
    expect(report.status).toBe('open');
    expect(report.ended).toBe(true);
    const byName = new Map(report.shops.map((r) => [r.shop.name, r]));
    expect([...byName.keys()].sort()).toEqual(['=SUM(A1)', 'Dune Test Shop', 'Reef Test Shop']);
    const dune = byName.get('Dune Test Shop')!;
    // The job collected at 23:30 on 31 October (New York) is October's; the one still on the
    // bench and the two comeback returns were checked in in November.
    expect(dune.jobs).toEqual({ checkedIn: 5, ready: 2, collected: 3 });
    expect(dune.money).toEqual({
      labourCents: 24500,
      partsCents: 4725,
      discountCents: 1000,
      billedCents: 28225,
    });
    expect(dune.benchMinutes).toBe(195);
    // 28 225 ¢ × 60 / 195 min = 8 684.6 ¢ per bench hour → 8 685.
    expect(dune.revenuePerBenchHourCents).toBe(8685);
    // Ready in November: 600 and 1200 min (customer), 480 and 700 min (bench); type 7 quantiles.
    expect(dune.customerTurnaround).toEqual({ count: 2, medianMinutes: 900, p90Minutes: 1140 });
    expect(dune.benchTurnaround).toEqual({ count: 2, medianMinutes: 590, p90Minutes: 678 });
    expect(dune.onTime).toEqual({ onTime: 1, total: 2, share: 0.5 });
    // 20-day windows as of 2 December: d1 came back (workmanship), d2 and d3 closed clean; the
    // dismissed return of d2 is not a comeback.
    expect(dune.comebacks).toMatchObject({ events: 1, trials: 3 });
    expect(dune.comebacks.rate).toBeCloseTo(1 / 3, 12);
    // Wilson 95% for 1 of 3 (Newcombe 1998 method 3): 0.0615 to 0.7923.
    expect(dune.comebacks.lower).toBeCloseTo(0.0615, 4);
    expect(dune.comebacks.upper).toBeCloseTo(0.7923, 4);
    expect(dune.audits).toEqual({ rounds: 1, rejected: 1, failures: 2 });
    expect(dune.openCorrectiveActions).toBe(2);

    const reef = byName.get('Reef Test Shop')!;
    // 04:30Z on 1 November is still October in Chicago.
    expect(reef.jobs).toEqual({ checkedIn: 1, ready: 1, collected: 1 });
    expect(reef.money.billedCents).toBe(11100);
    // Collected 18 November: its 20-day window is still open on 2 December.
    expect(reef.comebacks).toEqual({ events: 0, trials: 0, rate: null, lower: null, upper: null });
    expect(reef.periodStart).toBe('2026-11-01');
    expect(reef.periodEnd).toBe('2026-11-30');
  });

  it('owner – royalties are billed revenue × rate, rounded half to even (checked by hand)', async () => {
    const report = await getMonthClose(net.owner, MONTH, { now: NOW });
    const royalty = (name: string) => report.shops.find((r) => r.shop.name === name)!;
    // Dune: 28 225 ¢ × 600 bp / 10 000 = 1 693.5 ¢; the tie goes to the even cent, 1 694 ¢ ($16.94).
    expect(royalty('Dune Test Shop').royaltyRateBp).toBe(600);
    expect(royalty('Dune Test Shop').royaltyCents).toBe(1694);
    // Reef: 11 100 ¢ × 550 bp / 10 000 = 610.5 ¢; the tie goes to the even cent, 610 ¢ ($6.10).
    expect(royalty('Reef Test Shop').royaltyRateBp).toBe(550);
    expect(royalty('Reef Test Shop').royaltyCents).toBe(610);
    // "=SUM(A1)": 1 000 ¢ × 450 bp / 10 000 = 45 ¢ exactly.
    expect(royalty('=SUM(A1)').royaltyCents).toBe(45);
    expect(report.totals.royaltyCents).toBe(1694 + 610 + 45);
  });

  it('owner – network totals pool the rates and the turnaround of every job', async () => {
    const { totals } = await getMonthClose(net.owner, MONTH, { now: NOW });
    expect(totals).toMatchObject({ label: 'All shops', shops: 3, royaltyRateBp: null });
    expect(totals.jobs).toEqual({ checkedIn: 7, ready: 4, collected: 5 });
    // Pooled ready jobs: 300, 600, 900, 1200 min → median 750, p90 900 + 0.7 × 300 = 1110.
    expect(totals.customerTurnaround).toEqual({ count: 4, medianMinutes: 750, p90Minutes: 1110 });
    expect(totals.comebacks).toMatchObject({ events: 1, trials: 4, rate: 0.25 });
    expect(totals.onTime).toEqual({ onTime: 2, total: 3, share: 2 / 3 });
  });
});

describe('month close – CSV', () => {
  it('owner – the CSV parsed back with papaparse equals the JSON', async () => {
    const report = await getMonthClose(net.owner, MONTH, { now: NOW });
    const { text, filename } = await csvOf(net.owner, MONTH, { now: NOW });
    expect(filename).toBe('reelwright-month-close-2026-11.csv');
    // RFC 4180: every record ends with CRLF, no bare line feeds.
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const parsed = parse(text);
    expect(parsed.meta.fields).toEqual(CSV_COLUMNS.map((c) => c.name));
    expect(parsed.data).toEqual([
      ...report.shops.map((row) => expectedRecord(report, row)),
      expectedRecord(report, report.totals),
    ]);
  });

  it('owner – the CSV carries the comeback estimate, O, E and jobs still followed; final-rate cells wait', async () => {
    const rows = parse((await csvOf(net.owner, MONTH, { now: NOW })).text).data;
    const reef = rows.find((r) => r.shop === 'Reef Test Shop')!;
    // Collected 18 November, 20-day window: still followed on 2 December, so no final rate yet.
    expect(reef.jobs_still_followed).toBe('1');
    expect(reef.comebacks_observed).toBe('0');
    expect([reef.comebacks, reef.comeback_trials, reef.comeback_rate]).toEqual(['', '', '']);
    // Kaplan–Meier with no event among the jobs followed: 0, its interval exact binomial.
    expect(Number(reef.comeback_estimate)).toBe(0);
    const dune = rows.find((r) => r.shop === 'Dune Test Shop')!;
    // Every window closed: the estimate is the final rate, 1 of 3 (Kaplan & Meier 1958: with no
    // censoring the product-limit estimate is the simple proportion).
    expect(dune.jobs_still_followed).toBe('0');
    expect(dune.comeback_estimate).toBe(dune.comeback_rate);
    expect(dune.comeback_rate).toBe((1 / 3).toFixed(4));
  });

  it('owner – a shop named "=SUM(A1)" comes out as text, negative amounts stay numbers', async () => {
    const { text } = await csvOf(net.owner, MONTH, { now: NOW });
    const rows = parse(text).data;
    const formula = rows.find((r) => r.shop_id === String(net.shops.formula.id))!;
    expect(formula.shop).toBe("'=SUM(A1)");
    expect(text).toContain(`,'=SUM(A1),`);
    for (const prefix of ['=', '+', '-', '@', '\t', '\r']) {
      expect(neutralise(`${prefix}cmd`)).toBe(`'${prefix}cmd`);
    }
    expect(neutralise('Dune Test Shop')).toBe('Dune Test Shop');
    expect(quote('Harbor, "North"')).toBe('"Harbor, ""North"""');
    // A negative amount (a discount larger than the work) is written as a plain number.
    const negative = csvLine(
      {
        kind: 'total',
        figures: {
          ...(await getMonthClose(net.owner, MONTH, { now: NOW })).totals,
          money: { labourCents: 0, partsCents: 0, discountCents: 1250, billedCents: -1250 },
        },
      },
      {
        month: MONTH,
        status: 'open',
        asOf: NOW.toISOString(),
        currency: 'USD',
        periodStart: '2026-11-01',
        periodEnd: '2026-11-30',
      },
    );
    const cells = Papa.parse<string[]>(negative.trimEnd()).data[0]!;
    expect(cells[CSV_COLUMNS.findIndex((c) => c.name === 'billed_revenue')]).toBe('-12.50');
  });

  it('owner – the totals row is the sum of the shop rows', async () => {
    const rows = parse((await csvOf(net.owner, MONTH, { now: NOW })).text).data;
    const shopRows = rows.filter((r) => r.row_type === 'shop');
    const total = rows.find((r) => r.row_type === 'total')!;
    expect(rows.at(-1)).toBe(total);
    expect(shopRows).toHaveLength(3);
    const counts = [
      'jobs_checked_in',
      'jobs_ready',
      'jobs_collected',
      'on_time_jobs',
      'promised_jobs',
      'comebacks_observed',
      'jobs_still_followed',
      'audit_rounds',
      'audit_rounds_rejected',
      'audit_failures',
      'open_corrective_actions',
      'customer_turnaround_jobs',
    ];
    for (const column of counts) {
      expect(Number(total[column]), column).toBe(
        shopRows.reduce((s, r) => s + Number(r[column]), 0),
      );
    }
    for (const column of ['labour', 'parts', 'discounts', 'billed_revenue', 'royalty_due']) {
      expect(cents(total[column]!), column).toBe(
        shopRows.reduce((s, r) => s + cents(r[column]!), 0),
      );
    }
    expect(total.shop).toBe('All shops (3)');
    expect(total.royalty_due).toBe('23.49');
  });

  it('regional manager – downloads the CSV of their region only, with region totals', async () => {
    const { text, filename } = await csvOf(net.north, MONTH, { now: NOW });
    expect(filename).toBe('reelwright-month-close-2026-11-test-north.csv');
    const rows = parse(text).data;
    expect(rows.filter((r) => r.row_type === 'shop').map((r) => r.region)).toEqual([
      'Test North',
      'Test North',
    ]);
    const total = rows.at(-1)!;
    expect(total.shop).toBe('Test North (2)');
    expect(total.billed_revenue).toBe('292.25');
  });
});

describe('month close – closing and reopening', () => {
  it('owner – cannot close a month that has not ended everywhere', async () => {
    // 05:30Z on 1 December: over in New York, not yet in Chicago.
    await expect(
      closeMonth(net.owner, MONTH, { now: new Date('2026-12-01T05:30:00Z') }),
    ).rejects.toMatchObject({
      status: 409,
    });
  });

  it('owner – closing freezes the figures; a later edit shows as a difference, not a change', async () => {
    await closeMonth(net.owner, MONTH, { now: NOW });
    await expect(closeMonth(net.owner, MONTH, { now: NOW })).rejects.toMatchObject({ status: 409 });
    const conn = state.handle!.db;
    await conn.update(jobs).set({ partsCents: 3550 }).where(eq(jobs.id, net.jobs.d1.id));
    const report = await getMonthClose(net.owner, MONTH, { now: new Date('2026-12-05T12:00:00Z') });
    expect(report.status).toBe('closed');
    expect(report.asOf).toBe(NOW.toISOString());
    expect(report.close?.closedBy).toBe('Olive Owner');
    const dune = report.shops.find((r) => r.shop.id === net.shops.dune.id)!;
    expect(dune.money.billedCents).toBe(28225);
    expect(dune.royaltyCents).toBe(1694);
    expect(report.differences).toEqual(
      expect.arrayContaining([
        expect.objectContaining({
          shopId: net.shops.dune.id,
          field: 'money.billedCents',
          frozen: 28225,
          live: 28325,
        }),
        // 28 325 × 600 / 10 000 = 1 699.5 → 1 700 (half to even).
        expect.objectContaining({
          shopId: net.shops.dune.id,
          field: 'royaltyCents',
          frozen: 1694,
          live: 1700,
        }),
      ]),
    );
    expect(report.differences!.every((d) => d.shopId === net.shops.dune.id)).toBe(true);
    // The CSV of a closed month is the frozen record, and still matches the JSON.
    const rows = parse((await csvOf(net.owner, MONTH)).text).data;
    expect(rows).toEqual([
      ...report.shops.map((row) => expectedRecord(report, row)),
      expectedRecord(report, report.totals),
    ]);
    expect(rows[0]!.status).toBe('closed');
  });

  it('regional manager – sees the frozen figures and totals of their region', async () => {
    const report = await getMonthClose(net.south, MONTH);
    expect(report.shops.map((r) => r.shop.name)).toEqual(['Reef Test Shop']);
    expect(report.totals).toMatchObject({ label: 'Test South', shops: 1, royaltyCents: 610 });
    expect(report.differences).toEqual([]);
  });

  it('owner – reopens with a reason; the close stays on record', async () => {
    await reopenMonth(net.owner, MONTH, 'A parts price on Dune job d1 was wrong.', {
      now: new Date('2026-12-06T12:00:00Z'),
    });
    await expect(reopenMonth(net.owner, MONTH, 'Again, for no reason.')).rejects.toMatchObject({
      status: 409,
    });
    const report = await getMonthClose(net.owner, MONTH, { now: new Date('2026-12-06T13:00:00Z') });
    expect(report.status).toBe('open');
    expect(report.differences).toBeNull();
    expect(report.history).toEqual([
      expect.objectContaining({
        closedBy: 'Olive Owner',
        reopenedBy: 'Olive Owner',
        reopenReason: 'A parts price on Dune job d1 was wrong.',
      }),
    ]);
    expect(report.shops.find((r) => r.shop.id === net.shops.dune.id)!.money.billedCents).toBe(
      28325,
    );
    // Closing again freezes the corrected figures as a new close.
    await closeMonth(net.owner, MONTH, { now: new Date('2026-12-06T14:00:00Z') });
    const again = await getMonthClose(net.owner, MONTH);
    expect(again.history).toHaveLength(2);
    expect(again.shops.find((r) => r.shop.id === net.shops.dune.id)!.royaltyCents).toBe(1700);
    await reopenMonth(net.owner, MONTH, 'Reset for the next test in this file.');
  });
});
