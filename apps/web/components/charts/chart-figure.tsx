import type { ReactNode } from 'react';

/**
 * A chart with a title that says what it shows, a sentence that says what it finds, and the
 * figures behind it as a table for anyone who cannot use the drawing (which is hidden from
 * assistive technology: it holds nothing the text and the table do not).
 */
export function ChartFigure(props: {
  id: string;
  title: string;
  summary: ReactNode;
  children: ReactNode;
  table: ReactNode;
  tableLabel?: string;
  /** Key of the drawing; one per legend entry, words not colour alone. */
  legend?: ReactNode;
}) {
  return (
    <figure aria-labelledby={`${props.id}-title`} className="min-w-0">
      <h3 id={`${props.id}-title`} className="text-base font-semibold text-slate-900">
        {props.title}
      </h3>
      <p id={`${props.id}-summary`} className="mt-1 text-slate-700">
        {props.summary}
      </p>
      {props.legend && <div className="mt-2">{props.legend}</div>}
      {/* The drawing repeats the summary and the table for sighted readers; assistive technology reads those instead. */}
      <div aria-hidden="true" className="mt-3">
        {props.children}
      </div>
      <details className="mt-2 rounded-md border border-sand-200 bg-sand-50 px-3 py-2">
        <summary className="cursor-pointer font-medium text-sea-800">
          {props.tableLabel ?? 'Show the figures as a table'}
        </summary>
        <div className="mt-3 overflow-x-auto">{props.table}</div>
      </details>
    </figure>
  );
}

/** A legend entry: the mark drawn in the chart and its words. */
export function LegendItem(props: {
  colour: string;
  mark?: 'dot' | 'ring' | 'line' | 'dash' | 'triangle' | 'diamond';
  children: ReactNode;
}) {
  const mark = props.mark ?? 'dot';
  return (
    <span className="inline-flex items-center gap-1.5 text-sm text-slate-700">
      <svg aria-hidden="true" width="18" height="12" viewBox="0 0 18 12">
        {mark === 'dot' && <circle cx="9" cy="6" r="4.5" fill={props.colour} />}
        {mark === 'ring' && (
          <circle cx="9" cy="6" r="4" fill="#ffffff" stroke={props.colour} strokeWidth="1.5" />
        )}
        {mark === 'triangle' && <path d="M9 1 L14.5 11 L3.5 11 Z" fill={props.colour} />}
        {mark === 'diamond' && <path d="M9 0.5 L15 6 L9 11.5 L3 6 Z" fill={props.colour} />}
        {mark === 'line' && (
          <line x1="0" y1="6" x2="18" y2="6" stroke={props.colour} strokeWidth="2.5" />
        )}
        {mark === 'dash' && (
          <line
            x1="0"
            y1="6"
            x2="18"
            y2="6"
            stroke={props.colour}
            strokeWidth="2"
            strokeDasharray="4 3"
          />
        )}
      </svg>
      {props.children}
    </span>
  );
}

/** A plain table for a chart's figures; numbers right-aligned in tabular figures. */
export function FigureTable(props: {
  caption: string;
  columns: { label: string; numeric?: boolean }[];
  rows: { key: string; cells: ReactNode[] }[];
}) {
  return (
    <table className="w-full min-w-[28rem] text-left text-sm">
      <caption className="sr-only">{props.caption}</caption>
      <thead>
        <tr className="border-b border-sand-300 text-slate-600">
          {props.columns.map((c, i) => (
            <th
              key={c.label}
              scope="col"
              className={`py-1.5 pr-3 font-medium ${c.numeric ? 'num' : ''} ${i === 0 ? '' : ''}`}
            >
              {c.label}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {props.rows.map((r) => (
          <tr key={r.key} className="border-b border-sand-100">
            {r.cells.map((cell, i) =>
              i === 0 ? (
                <th key={i} scope="row" className="py-1.5 pr-3 font-medium">
                  {cell}
                </th>
              ) : (
                <td key={i} className={`py-1.5 pr-3 ${props.columns[i]?.numeric ? 'num' : ''}`}>
                  {cell}
                </td>
              ),
            )}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Series colours for per-shop lines: the brand's sea, brass and slate in distinct shades. */
export const SERIES_COLOURS = [
  { tremor: 'sea-700', hex: '#1f514a' },
  { tremor: 'brass-500', hex: '#b08330' },
  { tremor: 'slate-500', hex: '#64748b' },
  { tremor: 'sea-400', hex: '#4f998c' },
  { tremor: 'brass-800', hex: '#5f4121' },
  { tremor: 'slate-800', hex: '#1e293b' },
  { tremor: 'brass-300', hex: '#d8b66a' },
  { tremor: 'sea-200', hex: '#acd6cd' },
];
