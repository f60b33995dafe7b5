import type { MonthCloseData } from '~/lib/queries/month-close';
import {
  DASH,
  hours,
  INVOICE_LABELS,
  INVOICE_STYLES,
  money,
  n,
  percent,
  rateBp,
  utc,
} from './format';
import { ShopFiguresTable, type Row, type Totals } from './shop-table';

function InvoiceBadge({ row }: { row: Row }) {
  const status = row.invoice?.status ?? 'none';
  if (row.royaltyCents <= 0 && !row.invoice)
    return <span className="text-slate-600">Nothing due</span>;
  return (
    <span
      className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset ${INVOICE_STYLES[status]}`}
    >
      {INVOICE_LABELS[status]}
    </span>
  );
}

export function MoneyTable({ report }: { report: MonthCloseData }) {
  const c = report.currency;
  return (
    <ShopFiguresTable
      title="Revenue and royalties"
      description={`Billed revenue of the jobs collected in the month (labour + parts − discounts), in ${c}. Royalty = billed revenue × the shop's rate, rounded to the cent, half to even.`}
      label="Revenue and royalties per shop"
      caption="Revenue, royalty and invoice per shop"
      minWidth="min-w-[50rem]"
      columns={[
        { label: 'Labour', num: true },
        { label: 'Parts', num: true },
        { label: 'Discounts', num: true },
        { label: 'Billed revenue', num: true },
        { label: 'Royalty rate', num: true },
        { label: 'Royalty due', num: true },
        { label: 'Invoice' },
      ]}
      report={report}
      rowCells={(r) => (
        <>
          <td className="num py-3 pr-4">{money(r.money.labourCents, c)}</td>
          <td className="num py-3 pr-4">{money(r.money.partsCents, c)}</td>
          <td className="num py-3 pr-4">{money(r.money.discountCents, c)}</td>
          <td className="num py-3 pr-4 font-medium">{money(r.money.billedCents, c)}</td>
          <td className="num py-3 pr-4">{rateBp(r.royaltyRateBp)}</td>
          <td className="num py-3 pr-4 font-medium">{money(r.royaltyCents, c)}</td>
          <td className="py-3">
            <InvoiceBadge row={r} />
          </td>
        </>
      )}
      totalCells={(t) => (
        <>
          <td className="num py-3 pr-4">{money(t.money.labourCents, c)}</td>
          <td className="num py-3 pr-4">{money(t.money.partsCents, c)}</td>
          <td className="num py-3 pr-4">{money(t.money.discountCents, c)}</td>
          <td className="num py-3 pr-4">{money(t.money.billedCents, c)}</td>
          <td className="num py-3 pr-4">{DASH}</td>
          <td className="num py-3 pr-4">{money(t.royaltyCents, c)}</td>
          <td className="py-3" />
        </>
      )}
    />
  );
}

export function WorkTable({ report }: { report: MonthCloseData }) {
  const c = report.currency;
  const cells = (f: Row | Totals) => (
    <>
      <td className="num py-3 pr-4">{n(f.jobs.checkedIn)}</td>
      <td className="num py-3 pr-4">{n(f.jobs.ready)}</td>
      <td className="num py-3 pr-4">{n(f.jobs.collected)}</td>
      <td className="num py-3 pr-4">{(f.benchMinutes / 60).toFixed(1)}</td>
      <td className="num py-3 pr-4">{money(f.revenuePerBenchHourCents, c)}</td>
      <td className="num py-3">
        {percent(f.onTime.share, 0)}
        <span className="block text-sm font-normal text-slate-600">
          {n(f.onTime.onTime)} of {n(f.onTime.total)}
        </span>
      </td>
    </>
  );
  return (
    <ShopFiguresTable
      title="Work and bench time"
      description="Jobs checked in, ready and collected in the month. Bench hours are those logged on the jobs collected, so revenue per bench hour compares like with like. Ready on time: ready by the promised time, of the jobs ready in the month that had one."
      label="Work and bench time per shop"
      caption="Jobs, bench time and on-time share per shop"
      minWidth="min-w-[46rem]"
      columns={[
        { label: 'Checked in', num: true },
        { label: 'Ready', num: true },
        { label: 'Collected', num: true },
        { label: 'Bench hours', num: true },
        { label: 'Revenue per bench hour', num: true },
        { label: 'Ready on time', num: true },
      ]}
      report={report}
      rowCells={cells}
      totalCells={cells}
    />
  );
}

export function TurnaroundTable({ report }: { report: MonthCloseData }) {
  const cells = (f: Row | Totals) => (
    <>
      <td className="num py-3 pr-4">{n(f.customerTurnaround.count)}</td>
      <td className="num py-3 pr-4">{hours(f.customerTurnaround.medianMinutes)}</td>
      <td className="num py-3 pr-4">{hours(f.customerTurnaround.p90Minutes)}</td>
      <td className="num py-3 pr-4">{hours(f.benchTurnaround.medianMinutes)}</td>
      <td className="num py-3">{hours(f.benchTurnaround.p90Minutes)}</td>
    </>
  );
  return (
    <ShopFiguresTable
      title="Turnaround"
      description="Business hours (opening hours only) for the jobs that became ready in the month: customer turnaround from check-in to ready; bench turnaround without the time waiting on parts. Median and 90th percentile (Hyndman & Fan type 7)."
      label="Turnaround per shop"
      caption="Customer and bench turnaround per shop"
      minWidth="min-w-[40rem]"
      columns={[
        { label: 'Jobs ready', num: true },
        { label: 'Customer median', num: true },
        { label: 'Customer 90th percentile', num: true },
        { label: 'Bench median', num: true },
        { label: 'Bench 90th percentile', num: true },
      ]}
      report={report}
      rowCells={cells}
      totalCells={cells}
    />
  );
}

export function QualityTable({ report }: { report: MonthCloseData }) {
  const cells = (f: Row | Totals) => (
    <>
      <td className="num py-3 pr-4">
        {percent(f.comebacks.rate)}
        <span className="block text-sm font-normal text-slate-600">
          {n(f.comebacks.events)} of {n(f.comebacks.trials)}
        </span>
      </td>
      <td className="num py-3 pr-4">
        {f.comebacks.lower == null || f.comebacks.upper == null
          ? DASH
          : `${percent(f.comebacks.lower)} – ${percent(f.comebacks.upper)}`}
      </td>
      <td className="num py-3 pr-4">{n(f.audits.rounds)}</td>
      <td className="num py-3 pr-4">{n(f.audits.rejected)}</td>
      <td className="num py-3 pr-4">{n(f.audits.failures)}</td>
      <td className="num py-3">{n(f.openCorrectiveActions)}</td>
    </>
  );
  return (
    <ShopFiguresTable
      title="Quality"
      description={`Comeback rate of the jobs collected in the month whose ${report.warrantyDays}-day warranty window had closed by ${utc(report.asOf)}, plus those that already came back. Jobs still inside their window are left out; soon after the month ends that is most of them, so the rate rests on few jobs and leans on the returns: read the interval as well as the rate. Audit rounds decided in the month; corrective actions open at its end.`}
      label="Quality per shop"
      caption="Comebacks, audits and corrective actions per shop"
      minWidth="min-w-[48rem]"
      columns={[
        { label: 'Comeback rate', num: true },
        { label: '95% Wilson interval', num: true },
        { label: 'Audit rounds', num: true },
        { label: 'Lots rejected', num: true },
        { label: 'Audit failures', num: true },
        { label: 'Open corrective actions', num: true },
      ]}
      report={report}
      rowCells={cells}
      totalCells={cells}
    />
  );
}
