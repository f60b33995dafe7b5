import type { ReactNode } from 'react';
import { Panel } from '~/components/ui';
import type { MonthCloseData } from '~/lib/queries/month-close';
import { n } from './format';

export type Row = MonthCloseData['shops'][number];
export type Totals = MonthCloseData['totals'];

/** A wide table scrolls on its own, reachable and named for keyboard and screen-reader users. */
export function TableFrame({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="overflow-x-auto" role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}

export function Th({ children, num }: { children: ReactNode; num?: boolean }) {
  return (
    <th scope="col" className={`py-2 pr-4 align-bottom font-medium ${num ? 'num' : ''}`}>
      {children}
    </th>
  );
}

function ShopCell({ row }: { row: Row }) {
  return (
    <th scope="row" className="py-3 pr-4 font-medium">
      <span className="block">{row.shop.name}</span>
      <span className="block text-sm font-normal text-slate-600">{row.shop.regionName}</span>
    </th>
  );
}

function TotalsCell({ totals }: { totals: Totals }) {
  return (
    <th scope="row" className="py-3 pr-4">
      {totals.label}
      <span className="block text-sm font-normal text-slate-600">
        {n(totals.shops)} shop{totals.shops === 1 ? '' : 's'}
      </span>
    </th>
  );
}

/**
 * A panel with one row per shop and a totals row: the shop heads each row, then the figures
 * that `rowCells` and `totalCells` draw under the given column headings.
 */
export function ShopFiguresTable(props: {
  title: string;
  description: string;
  /** Names the scrolling region. */
  label: string;
  caption: string;
  /** The table's least width, a class such as "min-w-[46rem]". */
  minWidth: string;
  /** The headings after "Shop"; numeric ones are right-aligned. */
  columns: { label: string; num?: boolean }[];
  report: MonthCloseData;
  rowCells: (row: Row) => ReactNode;
  totalCells: (totals: Totals) => ReactNode;
}) {
  return (
    <Panel title={props.title} description={props.description}>
      <TableFrame label={props.label}>
        <table className={`w-full ${props.minWidth} text-left`}>
          <caption className="sr-only">{props.caption}</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              {props.columns.map((c) => (
                <Th key={c.label} num={c.num}>
                  {c.label}
                </Th>
              ))}
            </tr>
          </thead>
          <tbody>
            {props.report.shops.map((r) => (
              <tr key={r.shop.id} className="border-b border-sand-100">
                <ShopCell row={r} />
                {props.rowCells(r)}
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <TotalsCell totals={props.report.totals} />
              {props.totalCells(props.report.totals)}
            </tr>
          </tfoot>
        </table>
      </TableFrame>
    </Panel>
  );
}
