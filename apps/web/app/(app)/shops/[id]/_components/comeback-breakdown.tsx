import Link from 'next/link';
import { Panel } from '~/components/ui';
import { formatCount } from '~/lib/format';
import { ATTRIBUTION_LABELS } from '~/lib/comebacks';
import type { BreakdownRow, ComebackBreakdown } from '~/server/queries/comebacks';
import { formatPeriod } from '../../../network/_components/periods';

const pct = (n: number, of: number) => (of > 0 ? `${((n / of) * 100).toFixed(1)}%` : '—');

function BreakdownTable(props: {
  caption: string;
  first: string;
  rows: BreakdownRow[];
  total: { confirmed: number; counted: number };
}) {
  return (
    <table className="w-full text-left">
      <caption className="mb-2 text-left font-semibold text-slate-900">{props.caption}</caption>
      <thead>
        <tr className="border-b border-sand-300 text-sm text-slate-600">
          <th scope="col" className="py-2 pr-3 font-medium">
            {props.first}
          </th>
          <th scope="col" className="num py-2 pr-3 font-medium">
            Confirmed
          </th>
          <th scope="col" className="num py-2 font-medium">
            Counted in the rate
          </th>
        </tr>
      </thead>
      <tbody>
        {props.rows.map((r) => (
          <tr key={r.key} className="border-b border-sand-100">
            <th scope="row" className="py-2 pr-3 font-normal">
              {r.label}
            </th>
            <td className="num py-2 pr-3">{formatCount(r.confirmed)}</td>
            <td className="num py-2">{formatCount(r.counted)}</td>
          </tr>
        ))}
      </tbody>
      <tfoot>
        <tr>
          <th scope="row" className="py-2 pr-3 font-semibold">
            All
          </th>
          <td className="num py-2 pr-3 font-semibold">{formatCount(props.total.confirmed)}</td>
          <td className="num py-2 font-semibold">{formatCount(props.total.counted)}</td>
        </tr>
      </tfoot>
    </table>
  );
}

/**
 * The period's confirmed comebacks of the shop by root cause, by the checklist step they trace
 * to and (for the shop lead, regional manager and owner) by the original job's technician.
 */
export function ComebackBreakdownPanel(props: { shopId: number; data: ComebackBreakdown }) {
  const d = props.data;
  const period = formatPeriod(d.period.from, d.period.to);
  const counted = d.countedAttributions
    .map((a) => ATTRIBUTION_LABELS[a].toLowerCase())
    .join(' or ');
  const total = { confirmed: d.confirmed, counted: d.counted };
  return (
    <div className="mt-8">
      <Panel
        title={`Where the comebacks come from, ${period}`}
        description={`Confirmed comebacks of jobs collected in ${period} that came back inside the ${d.warrantyDays}-day warranty window. Those attributed to ${counted} count in the comeback rate.`}
      >
        {d.confirmed === 0 ? (
          <p className="text-slate-700">
            No confirmed comebacks of jobs collected in this period.{' '}
            <Link
              href={`/comebacks?shop=${props.shopId}`}
              className="text-sea-700 underline underline-offset-2"
            >
              See the shop&apos;s review queue
            </Link>
            .
          </p>
        ) : (
          <div className="grid items-start gap-8 lg:grid-cols-2">
            <BreakdownTable
              caption="By root cause"
              first="Root cause"
              rows={d.byRootCause}
              total={total}
            />
            <BreakdownTable
              caption="By checklist step"
              first="Step it traces to"
              rows={d.byStep}
              total={total}
            />
            {d.byTechnician && (
              <div className="lg:col-span-2">
                <table className="w-full text-left">
                  <caption className="mb-2 text-left font-semibold text-slate-900">
                    By technician of the original job
                  </caption>
                  <thead>
                    <tr className="border-b border-sand-300 text-sm text-slate-600">
                      <th scope="col" className="py-2 pr-3 font-medium">
                        Technician
                      </th>
                      <th scope="col" className="num py-2 pr-3 font-medium">
                        Jobs collected
                      </th>
                      <th scope="col" className="num py-2 pr-3 font-medium">
                        Confirmed
                      </th>
                      <th scope="col" className="num py-2 pr-3 font-medium">
                        Counted in the rate
                      </th>
                      <th scope="col" className="num py-2 font-medium">
                        Counted per job collected
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {d.byTechnician.map((r) => (
                      <tr key={r.key} className="border-b border-sand-100">
                        <th scope="row" className="py-2 pr-3 font-normal">
                          {r.label}
                        </th>
                        <td className="num py-2 pr-3">{formatCount(r.collected)}</td>
                        <td className="num py-2 pr-3">{formatCount(r.confirmed)}</td>
                        <td className="num py-2 pr-3">{formatCount(r.counted)}</td>
                        <td className="num py-2">{pct(r.counted, r.collected)}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
                <p className="mt-2 text-sm text-slate-600">
                  Per job collected, including jobs whose window is still open: a raw share for
                  spotting who needs help, not the comeback rate.
                </p>
              </div>
            )}
          </div>
        )}
      </Panel>
    </div>
  );
}
