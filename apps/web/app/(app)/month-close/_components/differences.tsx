import { Panel } from '~/components/ui';
import type { MonthCloseData } from '~/lib/queries/month-close';
import { DASH, hours, money, n, rateBp } from './format';
import { TableFrame, Th } from './shop-table';

/** The frozen figures of a closed month that the live data no longer matches. */
export function Differences({ report }: { report: MonthCloseData }) {
  const diffs = report.differences ?? [];
  const show = (field: string, value: number | null) =>
    value == null
      ? DASH
      : field.startsWith('money.') || field === 'royaltyCents'
        ? money(value, report.currency)
        : field.endsWith('Minutes') && field !== 'benchMinutes'
          ? hours(value)
          : field === 'royaltyRateBp'
            ? rateBp(value)
            : n(value);
  if (!diffs.length)
    return (
      <p className="rounded-md border border-sand-200 bg-white px-5 py-4 text-slate-700">
        <span className="font-medium text-slate-900">No changes since closing.</span> The live
        figures, judged as of the close, still match the frozen ones.
      </p>
    );
  return (
    <Panel
      title="Changed since closing"
      description="Jobs or reviews edited after the close. The frozen figures stay the record; reopen and close the month again to take the changes in."
    >
      <TableFrame label="Figures changed since closing">
        <table className="w-full min-w-[36rem] text-left">
          <caption className="sr-only">Figures changed since the month was closed</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              <Th>Figure</Th>
              <Th num>Frozen</Th>
              <Th num>Live now</Th>
            </tr>
          </thead>
          <tbody>
            {diffs.map((d) => (
              <tr key={`${d.shopId}-${d.field}`} className="border-b border-sand-100">
                <th scope="row" className="py-3 pr-4 font-medium">
                  {d.shopName}
                </th>
                <td className="py-3 pr-4">{d.label}</td>
                <td className="num py-3 pr-4">{show(d.field, d.frozen)}</td>
                <td className="num py-3 font-semibold text-amber-900">{show(d.field, d.live)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </TableFrame>
    </Panel>
  );
}
