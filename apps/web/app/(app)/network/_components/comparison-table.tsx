'use client';

import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import Link from 'next/link';
import Papa from 'papaparse';
import { useState } from 'react';
import type { TurnaroundUnit } from '~/lib/network';
import type { NetworkComparisonResult, ShopFigures } from '~/server/queries/network';
import { SeverityBadge } from '../../audits/_components/badges';
import { BandBadge } from './band-badge';
import { Explain } from './explain';
import {
  bandExplanation,
  DASH,
  formatCount,
  formatDuration,
  formatInterval,
  formatMoney,
  formatPercent,
  inUnit,
  unitWord,
} from './format';
import {
  actionsText,
  auditText,
  comebackBandText,
  comebackText,
  formatScore,
  jobsReadyText,
  onTimeText,
  realisationText,
  revenueText,
  roundsDecidedText,
  turnaroundText,
} from './explanations';
import { formatPeriod, viewHref } from './periods';

const column = createColumnHelper<ShopFigures>();
const orUndefined = (x: number | null) => (x === null ? undefined : x);

// Long headings get room for two lines; otherwise the table's narrow figures would squeeze them
// to a word a line.
const HEAD_MIN_WIDTH: Record<string, string> = {
  revenue: 'min-w-[7.5rem]',
  realisation: 'min-w-[6.5rem]',
  actions: 'min-w-[7.5rem]',
};

export function ComparisonTable(props: {
  data: NetworkComparisonResult;
  unit: TurnaroundUnit;
  caption: string;
}) {
  const { data, unit } = props;
  const [sorting, setSorting] = useState<SortingState>([]);
  const networkRate = data.network.comebacks.rate;
  const auditRate = data.network.audits.rate;
  const shopHref = (id: number) =>
    viewHref(`/shops/${id}`, { from: data.period.from, to: data.period.to, units: unit });
  const turnaround = (which: 'customer' | 'bench', q: 'median' | 'p90') =>
    column.accessor(
      (f) => {
        const t = which === 'customer' ? f.customerTurnaround : f.benchTurnaround;
        return t[q] === null ? undefined : inUnit(t[q], unit, f.shop.openMinutesPerDay);
      },
      {
        id: `${which}-${q}`,
        header: q === 'median' ? 'Median' : 'p90',
        sortUndefined: 'last',
        sortDescFirst: true,
        cell: ({ row }) => {
          const f = row.original;
          const t = which === 'customer' ? f.customerTurnaround : f.benchTurnaround;
          return (
            <Explain text={turnaroundText(f, which, q, unit)}>
              {formatDuration(t[q], unit, f.shop.openMinutesPerDay)}
            </Explain>
          );
        },
      },
    );

  const columns = [
    column.accessor((f) => f.shop.name, {
      id: 'shop',
      header: 'Shop',
      cell: ({ row }) => (
        <>
          <Link
            href={shopHref(row.original.shop.id)}
            className="font-semibold text-sea-700 underline-offset-2 hover:underline"
          >
            {row.original.shop.name}
          </Link>
          <span className="block text-sm font-normal whitespace-nowrap text-slate-600">
            {row.original.shop.region.name}
          </span>
        </>
      ),
    }),
    column.accessor('jobsReady', {
      id: 'jobs-ready',
      header: 'Jobs ready',
      sortDescFirst: true,
      cell: ({ row }) => (
        <Explain text={jobsReadyText(row.original)}>{formatCount(row.original.jobsReady)}</Explain>
      ),
    }),
    column.group({
      id: 'customer',
      header: 'Customer turnaround',
      columns: [turnaround('customer', 'median'), turnaround('customer', 'p90')],
    }),
    column.group({
      id: 'bench',
      header: 'Bench turnaround',
      columns: [turnaround('bench', 'median'), turnaround('bench', 'p90')],
    }),
    column.accessor((f) => orUndefined(f.onTime.share), {
      id: 'on-time',
      header: 'On time',
      sortUndefined: 'last',
      sortDescFirst: true,
      cell: ({ row }) => {
        const o = row.original.onTime;
        return <Explain text={onTimeText(row.original)}>{formatPercent(o.share, 0)}</Explain>;
      },
    }),
    column.accessor((f) => orUndefined(f.comebacks.rate), {
      id: 'comeback-rate',
      header: 'Comeback rate',
      sortUndefined: 'last',
      sortDescFirst: true,
      cell: ({ row }) => {
        const c = row.original.comebacks;
        return (
          <div className="flex flex-col items-end gap-1">
            <Explain text={comebackText(row.original, data.settings)}>
              <span className="font-semibold">{formatPercent(c.rate)}</span>
            </Explain>
            <span className="text-xs whitespace-nowrap text-slate-600">
              {c.interval
                ? formatInterval(c.interval)
                : `${formatCount(c.events)}/${formatCount(c.trials)}`}
            </span>
            <Explain text={comebackBandText(c, networkRate)} className="no-underline">
              <BandBadge band={c.band} side={c.side} />
            </Explain>
          </div>
        );
      },
    }),
    column.accessor((f) => orUndefined(f.revenue.perBenchHourCents), {
      id: 'revenue',
      header: 'Revenue per bench hour',
      sortUndefined: 'last',
      sortDescFirst: true,
      cell: ({ row }) => {
        const r = row.original.revenue;
        return (
          <Explain text={revenueText(row.original)}>{formatMoney(r.perBenchHourCents)}</Explain>
        );
      },
    }),
    column.accessor((f) => orUndefined(f.revenue.realisation), {
      id: 'realisation',
      header: 'Labour rate realised',
      sortUndefined: 'last',
      sortDescFirst: true,
      cell: ({ row }) => {
        const r = row.original.revenue;
        return (
          <Explain text={realisationText(row.original)}>{formatPercent(r.realisation, 0)}</Explain>
        );
      },
    }),
    column.accessor((f) => orUndefined(f.audits.rate), {
      id: 'audits',
      header: 'Audit results',
      sortUndefined: 'last',
      sortDescFirst: true,
      cell: ({ row }) => {
        const a = row.original.audits;
        if (a.rounds === 0)
          return (
            <Explain text={auditText(row.original)} className="text-slate-600">
              No rounds yet
            </Explain>
          );
        return (
          <div className="flex flex-col items-end gap-1">
            <Explain text={auditText(row.original)}>
              {a.trials === 0
                ? 'None scored yet'
                : `${formatCount(a.events)} failed of ${formatCount(a.trials)}`}
            </Explain>
            {a.averageScore !== null && (
              <span className="text-sm text-slate-700">Average {formatScore(a.averageScore)}</span>
            )}
            {a.trials > 0 && (
              <Explain
                text={bandExplanation('audit samples', a, auditRate)}
                className="no-underline"
              >
                <BandBadge band={a.band} side={a.side} />
              </Explain>
            )}
            {a.roundsAccepted + a.roundsRejected > 0 && (
              <span className="text-sm whitespace-nowrap text-slate-700">
                {roundsDecidedText(a)}
              </span>
            )}
            {a.severity !== 'normal' && <SeverityBadge severity={a.severity} />}
          </div>
        );
      },
    }),
    column.accessor((f) => f.correctiveActions.open, {
      id: 'actions',
      header: 'Open corrective actions',
      sortDescFirst: true,
      cell: ({ row }) => {
        const a = row.original.correctiveActions;
        return (
          <Explain text={actionsText(row.original)}>
            {formatCount(a.open)}
            {a.overdue > 0 && <span className="text-brick-700"> ({a.overdue} late)</span>}
          </Explain>
        );
      },
    }),
  ];

  const table = useReactTable({
    data: data.shops,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  const download = () => {
    const csv = toCsv(
      table.getRowModel().rows.map((r) => r.original),
      data,
      unit,
    );
    const url = URL.createObjectURL(new Blob([csv], { type: 'text/csv;charset=utf-8' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = `reelwright-network-${data.period.from}-to-${data.period.to}.csv`;
    document.body.append(a);
    a.click();
    a.remove();
    URL.revokeObjectURL(url);
  };

  if (data.shops.length === 0) {
    return <p className="py-6 text-center text-slate-600">No shops in this view.</p>;
  }

  const view = data.view;
  return (
    <>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-slate-600">
          Select a column heading to sort. Hover over or focus a figure for what it means.
          <span className="2xl:hidden"> Scroll the table sideways for every column.</span>
        </p>
        <button
          type="button"
          onClick={download}
          className="min-h-11 rounded-md border border-sea-700 px-4 font-medium text-sea-800 hover:bg-sea-50"
        >
          Download CSV
        </button>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[58rem] text-left text-sm xl:text-base">
          <caption className="sr-only">{props.caption}</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="text-sm text-slate-600">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const leaf = header.subHeaders.length === 0;
                  if (header.isPlaceholder) {
                    return <td key={header.id} aria-hidden="true" />;
                  }
                  const first = header.column.id === 'shop';
                  const minWidth = HEAD_MIN_WIDTH[header.column.id] ?? '';
                  return (
                    <th
                      key={header.id}
                      colSpan={header.colSpan}
                      scope={leaf ? 'col' : 'colgroup'}
                      aria-sort={
                        leaf && sorted ? (sorted === 'asc' ? 'ascending' : 'descending') : undefined
                      }
                      className={`px-2 py-2 align-bottom font-medium ${leaf ? 'border-b border-sand-300' : 'border-b border-sand-200 text-center'} ${first ? 'sticky left-0 z-10 bg-white pl-0 text-left' : leaf ? 'text-right' : ''} ${minWidth}`}
                    >
                      {leaf ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className={`inline-flex min-h-11 items-end gap-1 rounded-sm font-medium text-slate-700 hover:text-sea-800 ${first ? '' : 'justify-end text-right'}`}
                        >
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true" className="w-3 text-sea-700">
                            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}
                          </span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-sand-100 align-top">
                {row.getVisibleCells().map((cell) =>
                  cell.column.id === 'shop' ? (
                    <th
                      key={cell.id}
                      scope="row"
                      className="sticky left-0 z-10 min-w-[8.5rem] bg-white py-3 pr-2 text-left font-medium"
                    >
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </th>
                  ) : (
                    <td key={cell.id} className="num px-2 py-3 whitespace-nowrap">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ),
                )}
              </tr>
            ))}
          </tbody>
          <tfoot className="text-sm">
            <tr className="font-semibold">
              <th scope="row" className="sticky left-0 z-10 bg-white py-3 pr-2 text-left">
                {view.shops === data.network.shops ? 'Network' : `These ${view.shops} shops`}
              </th>
              <td className="num px-2 py-3">{formatCount(view.jobsReady)}</td>
              <td colSpan={5} />
              <td className="num px-2 py-3">
                {formatPercent(view.comebacks.rate)}
                <span className="block text-xs font-normal text-slate-600">
                  {formatCount(view.comebacks.events)}/{formatCount(view.comebacks.trials)}
                </span>
              </td>
              <td className="num px-2 py-3">{formatMoney(view.revenue.perBenchHourCents)}</td>
              <td />
              <td className="num px-2 py-3">
                {view.audits.rounds === 0
                  ? DASH
                  : `${formatCount(view.audits.events)} of ${formatCount(view.audits.trials)}`}
              </td>
              <td className="num px-2 py-3">{formatCount(view.correctiveActions.open)}</td>
            </tr>
            {view.shops !== data.network.shops && (
              <tr className="text-slate-700">
                <th
                  scope="row"
                  className="sticky left-0 z-10 bg-white py-2 pr-2 text-left font-medium"
                >
                  Whole network ({data.network.shops} shops)
                </th>
                <td className="num px-2 py-2">{formatCount(data.network.jobsReady)}</td>
                <td colSpan={5} />
                <td className="num px-2 py-2">{formatPercent(data.network.comebacks.rate)}</td>
                <td className="num px-2 py-2">
                  {formatMoney(data.network.revenue.perBenchHourCents)}
                </td>
                <td />
                <td className="num px-2 py-2">
                  {data.network.audits.rounds === 0
                    ? DASH
                    : formatPercent(data.network.audits.rate)}
                </td>
                <td />
              </tr>
            )}
          </tfoot>
        </table>
      </div>
      <p className="mt-3 text-sm text-slate-600">
        {formatPeriod(data.period.from, data.period.to)}, each shop in its own time zone. Turnaround
        in {unitWord(unit)} of opening time (median and 90th percentile, Hyndman &amp; Fan type 7).
        Bands compare each shop with the whole network&apos;s rate using exact binomial funnel
        limits for its own volume: outside 95% is on watch, outside 99.8% is out of line.
      </p>
    </>
  );
}

const round = (x: number | null, digits: number) => (x === null ? '' : Number(x.toFixed(digits)));

/**
 * The table's rows in their current order as CSV. Papa.unparse separates rows with CRLF but
 * leaves the last row without one; the file ends with exactly one line break.
 */
export function toCsv(
  rows: readonly ShopFigures[],
  data: NetworkComparisonResult,
  unit: TurnaroundUnit,
) {
  const u = unit === 'days' ? 'business days' : 'business hours';
  const dur = (m: number | null, f: ShopFigures) =>
    m === null ? '' : round(inUnit(m, unit, f.shop.openMinutesPerDay), 2);
  const pct = (x: number | null | undefined) => (x == null ? '' : round(x * 100, 2));
  const csv = Papa.unparse({
    fields: [
      'Shop',
      'Region',
      'From',
      'To',
      'Jobs ready',
      `Customer turnaround median (${u})`,
      `Customer turnaround p90 (${u})`,
      `Bench turnaround median (${u})`,
      `Bench turnaround p90 (${u})`,
      'Jobs with a promised time',
      'Ready by the promised time',
      'On-time share (%)',
      'Jobs collected',
      'Comeback trials',
      'Comebacks counted',
      'Comeback rate (%)',
      'Comeback rate 95% lower (%)',
      'Comeback rate 95% upper (%)',
      'Comeback band',
      'Comeback comparison',
      'Comeback estimate method',
      'Jobs still followed',
      'Comebacks expected',
      'Comebacks observed ÷ expected',
      'Billed revenue ($)',
      'Labour ($)',
      'Bench hours',
      'Revenue per bench hour ($)',
      'Posted labour rate ($ per hour)',
      'Labour rate realised (%)',
      'Audit rounds',
      'Audit samples scored',
      'Audit failures',
      'Audit band',
      'Audit average score',
      'Audit rounds accepted',
      'Audit rounds rejected',
      'Next audit inspection',
      'Open corrective actions',
      'Overdue corrective actions',
    ],
    data: rows.map((f) => [
      f.shop.name,
      f.shop.region.name,
      data.period.from,
      data.period.to,
      f.jobsReady,
      dur(f.customerTurnaround.median, f),
      dur(f.customerTurnaround.p90, f),
      dur(f.benchTurnaround.median, f),
      dur(f.benchTurnaround.p90, f),
      f.onTime.total,
      f.onTime.onTime,
      pct(f.onTime.share),
      f.comebacks.collected,
      f.comebacks.trials,
      f.comebacks.events,
      pct(f.comebacks.rate),
      pct(f.comebacks.interval?.lower),
      pct(f.comebacks.interval?.upper),
      f.comebacks.band ?? '',
      f.comebacks.comparison === 'ratio' ? 'observed vs expected' : 'final rate',
      f.comebacks.estimate.method ?? '',
      f.comebacks.estimate.stillFollowed,
      f.comebacks.ratio ? round(f.comebacks.ratio.expected, 2) : '',
      f.comebacks.ratio?.ratio == null ? '' : round(f.comebacks.ratio.ratio, 3),
      (f.revenue.revenueCents / 100).toFixed(2),
      (f.revenue.labourCents / 100).toFixed(2),
      round(f.revenue.benchMinutes / 60, 2),
      f.revenue.perBenchHourCents === null ? '' : (f.revenue.perBenchHourCents / 100).toFixed(2),
      (f.shop.labourRateCents / 100).toFixed(2),
      pct(f.revenue.realisation),
      f.audits.rounds,
      f.audits.trials,
      f.audits.events,
      f.audits.band ?? '',
      f.audits.averageScore === null ? '' : round(f.audits.averageScore, 1),
      f.audits.roundsAccepted,
      f.audits.roundsRejected,
      f.audits.severity,
      f.correctiveActions.open,
      f.correctiveActions.overdue,
    ]),
  });
  return csv.endsWith('\n') ? csv : `${csv}\r\n`;
}
