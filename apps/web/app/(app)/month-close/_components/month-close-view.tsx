'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { Panel, Stat } from '~/components/ui';
import { ProblemError } from '~/lib/api-client';
import {
  closeMonthRequest,
  issueInvoicesRequest,
  monthCloseKeys,
  monthCloseQuery,
  monthCsvHref,
  reopenMonthRequest,
  type IssueData,
  type MonthCloseData,
} from '~/lib/queries/month-close';
import { reopenInput } from '~/lib/validators/month-close';
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

type Row = MonthCloseData['shops'][number];
type Totals = MonthCloseData['totals'];

const field =
  'min-h-11 rounded-md border border-sand-300 bg-white px-3 text-slate-900 shadow-sm focus-visible:border-sea-600';
const primary =
  'inline-flex min-h-11 items-center justify-center rounded-md bg-sea-700 px-4 font-medium text-white shadow-sm hover:bg-sea-800 disabled:cursor-not-allowed disabled:bg-sand-200 disabled:text-slate-700 disabled:shadow-none';
const secondary =
  'inline-flex min-h-11 items-center justify-center rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:cursor-not-allowed disabled:border-slate-300 disabled:text-slate-500';

function errorText(error: unknown) {
  if (error instanceof ProblemError) return error.problem.detail ?? error.message;
  return error instanceof Error ? error.message : 'Something went wrong.';
}

export function MonthCloseView(props: {
  month: string;
  months: { value: string; label: string }[];
  canManage: boolean;
  paymentsReady: boolean;
}) {
  const { data, isPending, isError, error } = useQuery(monthCloseQuery(props.month));
  if (isPending) return <p className="text-slate-600">Loading the month…</p>;
  if (isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load the month: {error.message}
      </p>
    );
  return (
    <div className="space-y-8">
      <Toolbar month={props.month} months={props.months} report={data} />
      {props.canManage && <OwnerActions report={data} paymentsReady={props.paymentsReady} />}
      <dl className="grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Stat
          label="Billed revenue"
          value={money(data.totals.money.billedCents, data.currency)}
          hint="Jobs collected in the month"
        />
        <Stat
          label="Royalty due"
          value={money(data.totals.royaltyCents, data.currency)}
          hint="Sum of each shop's royalty"
        />
        <Stat
          label="Jobs collected"
          value={n(data.totals.jobs.collected)}
          hint={`${n(data.totals.jobs.checkedIn)} checked in, ${n(data.totals.jobs.ready)} ready`}
        />
        <Stat
          label="Revenue per bench hour"
          value={money(data.totals.revenuePerBenchHourCents, data.currency)}
          hint={`${(data.totals.benchMinutes / 60).toFixed(0)} bench hours logged on collected jobs`}
        />
      </dl>
      {data.status === 'closed' && <Differences report={data} />}
      <MoneyTable report={data} />
      <WorkTable report={data} />
      <TurnaroundTable report={data} />
      <QualityTable report={data} />
      <Definitions report={data} />
      {data.history.length > 0 && <History report={data} />}
    </div>
  );
}

function Toolbar({
  month,
  months,
  report,
}: {
  month: string;
  months: { value: string; label: string }[];
  report: MonthCloseData;
}) {
  const id = useId();
  const close = report.close;
  return (
    <div className="flex flex-wrap items-end justify-between gap-4 rounded-lg border border-sand-200 bg-white p-5 shadow-sm">
      <form method="get" action="/month-close" className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-month`} className="text-sm font-medium text-slate-700">
            Month
          </label>
          <select id={`${id}-month`} name="month" defaultValue={month} className={field}>
            {months.map((m) => (
              <option key={m.value} value={m.value}>
                {m.label}
              </option>
            ))}
          </select>
        </div>
        <button type="submit" className={secondary}>
          Show
        </button>
      </form>
      <div className="flex flex-wrap items-center gap-4">
        <p className="text-slate-700" aria-live="polite">
          {close ? (
            <>
              <span className="mr-2 inline-flex items-center rounded-full bg-sea-700 px-2.5 py-0.5 text-sm font-medium text-white">
                Closed
              </span>
              {utc(close.closedAt)}
              {close.closedBy ? ` by ${close.closedBy}` : ''}
            </>
          ) : (
            <>
              <span className="mr-2 inline-flex items-center rounded-full bg-sand-100 px-2.5 py-0.5 text-sm font-medium text-slate-800 ring-1 ring-sand-300 ring-inset">
                Open
              </span>
              Live figures as of {utc(report.asOf)}
            </>
          )}
        </p>
        <a href={monthCsvHref(month)} download className={primary}>
          Download CSV
        </a>
      </div>
    </div>
  );
}

function OwnerActions({
  report,
  paymentsReady,
}: {
  report: MonthCloseData;
  paymentsReady: boolean;
}) {
  const queryClient = useQueryClient();
  const id = useId();
  const [confirming, setConfirming] = useState(false);
  const [reopening, setReopening] = useState(false);
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const [issued, setIssued] = useState<IssueData | null>(null);
  const key = monthCloseKeys.month(report.month);
  const store = (data: MonthCloseData) => queryClient.setQueryData(key, data);
  const close = useMutation({
    mutationFn: () => closeMonthRequest(report.month),
    onSuccess: (data) => {
      setConfirming(false);
      store(data);
    },
  });
  const reopen = useMutation({
    mutationFn: (why: string) => reopenMonthRequest(report.month, why),
    onSuccess: (data) => {
      setReopening(false);
      setReason('');
      setIssued(null);
      store(data);
    },
  });
  const issue = useMutation({
    mutationFn: () => issueInvoicesRequest(report.month),
    onSuccess: (result) => {
      setIssued(result);
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  const submitReopen = (event: FormEvent) => {
    event.preventDefault();
    const parsed = reopenInput.safeParse({ reason });
    if (!parsed.success) {
      setReasonError(parsed.error.issues[0]?.message ?? 'Give a reason.');
      return;
    }
    setReasonError(null);
    reopen.mutate(parsed.data.reason);
  };
  const label = report.label;
  const failure = close.error ?? reopen.error ?? issue.error;
  const invoiced = report.shops.filter((s) => s.invoice).length;
  const due = report.shops.filter((s) => s.royaltyCents > 0).length;
  const withStatus = (status: string) =>
    report.shops.filter((s) => s.invoice?.status === status).length;
  const standing = [
    [withStatus('paid'), 'paid'],
    [withStatus('open'), 'sent and unpaid'],
    [withStatus('failed'), 'with a failed payment'],
    [withStatus('pending'), 'not sent yet'],
  ]
    .filter(([count]) => count)
    .map(([count, what]) => `${count} ${what}`)
    .join(', ');

  return (
    <Panel
      title={report.status === 'closed' ? 'Royalty invoices' : `Close ${label}`}
      description={
        report.status === 'closed'
          ? `Invoices go to each shop through the payment provider: finalised and sent, payable in 30 days. Issuing again only sends what is missing; no shop is billed twice. ${invoiced} of ${due} shops with a royalty due have an invoice${standing ? `: ${standing}` : ''}.`
          : 'Closing freezes every shop’s figures and royalties as they stand now. A later edit to a job then shows as a difference against the live figures instead of changing the record.'
      }
    >
      <div className="flex flex-wrap items-center gap-3">
        {report.status === 'open' && !report.ended && (
          <p className="text-slate-700">
            {label} has not ended in every shop yet; it can be closed once it has.
          </p>
        )}
        {report.status === 'open' && report.ended && !confirming && (
          <button type="button" className={primary} onClick={() => setConfirming(true)}>
            Close {label}
          </button>
        )}
        {report.status === 'open' && report.ended && confirming && (
          <div className="flex flex-wrap items-center gap-3 rounded-md border border-brass-300 bg-brass-50 p-3">
            <p className="font-medium text-slate-900">
              Freeze the figures of all {report.shops.length} shops now?
            </p>
            <button
              type="button"
              className={primary}
              onClick={() => close.mutate()}
              disabled={close.isPending}
            >
              {close.isPending ? 'Closing…' : 'Yes, close the month'}
            </button>
            <button type="button" className={secondary} onClick={() => setConfirming(false)}>
              Cancel
            </button>
          </div>
        )}
        {report.status === 'closed' && (
          <>
            <button
              type="button"
              className={primary}
              onClick={() => issue.mutate()}
              disabled={issue.isPending || !paymentsReady}
            >
              {issue.isPending
                ? 'Issuing invoices…'
                : invoiced
                  ? 'Issue missing invoices'
                  : 'Issue royalty invoices'}
            </button>
            {!reopening && (
              <button type="button" className={secondary} onClick={() => setReopening(true)}>
                Reopen {label}
              </button>
            )}
          </>
        )}
      </div>
      {report.status === 'closed' && !paymentsReady && (
        <p className="mt-3 text-slate-700">
          Payments are not configured on this server (STRIPE_SECRET_KEY, or STRIPE_API_BASE for the
          local stand-in).
        </p>
      )}
      {reopening && report.status === 'closed' && (
        <form onSubmit={submitReopen} className="mt-4 max-w-2xl space-y-3" noValidate>
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-reason`} className="font-medium text-slate-800">
              Why reopen {label}?
            </label>
            <p id={`${id}-hint`} className="text-sm text-slate-600">
              The reason stays on record with the close. Invoices already issued are not changed.
            </p>
            <textarea
              id={`${id}-reason`}
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              rows={3}
              aria-invalid={reasonError ? true : undefined}
              aria-describedby={`${id}-hint${reasonError ? ` ${id}-error` : ''}`}
              className="rounded-md border border-sand-300 bg-white p-3 text-slate-900 shadow-sm focus-visible:border-sea-600"
            />
            {reasonError && (
              <p id={`${id}-error`} className="text-sm font-medium text-brick-700">
                {reasonError}
              </p>
            )}
          </div>
          <div className="flex gap-3">
            <button type="submit" className={primary} disabled={reopen.isPending}>
              {reopen.isPending ? 'Reopening…' : 'Reopen the month'}
            </button>
            <button type="button" className={secondary} onClick={() => setReopening(false)}>
              Cancel
            </button>
          </div>
        </form>
      )}
      <div aria-live="polite">
        {issued && (
          <p className="mt-4 rounded-md border border-sea-200 bg-sea-50 px-4 py-3 text-sea-900">
            {n(issued.issued)} invoice{issued.issued === 1 ? '' : 's'} issued
            {issued.alreadyIssued ? `, ${n(issued.alreadyIssued)} already issued` : ''}
            {issued.nothingDue ? `, ${n(issued.nothingDue)} with nothing due` : ''}
            {issued.failed ? `, ${n(issued.failed)} failed` : ''}.
          </p>
        )}
        {issued?.invoices
          .filter((i) => i.outcome === 'failed')
          .map((i) => (
            <p key={i.shopId} className="mt-2 text-brick-700">
              {i.shopName}: {i.error}
            </p>
          ))}
      </div>
      {failure && (
        <p role="alert" className="mt-4 text-brick-700">
          {errorText(failure)}
        </p>
      )}
    </Panel>
  );
}

function Differences({ report }: { report: MonthCloseData }) {
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

function TableFrame({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="overflow-x-auto" role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}

function Th({ children, num }: { children: ReactNode; num?: boolean }) {
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

function MoneyTable({ report }: { report: MonthCloseData }) {
  const c = report.currency;
  const t = report.totals;
  return (
    <Panel
      title="Revenue and royalties"
      description={`Billed revenue of the jobs collected in the month (labour + parts − discounts), in ${c}. Royalty = billed revenue × the shop's rate, rounded to the cent, half to even.`}
    >
      <TableFrame label="Revenue and royalties per shop">
        <table className="w-full min-w-[50rem] text-left">
          <caption className="sr-only">Revenue, royalty and invoice per shop</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              <Th num>Labour</Th>
              <Th num>Parts</Th>
              <Th num>Discounts</Th>
              <Th num>Billed revenue</Th>
              <Th num>Royalty rate</Th>
              <Th num>Royalty due</Th>
              <Th>Invoice</Th>
            </tr>
          </thead>
          <tbody>
            {report.shops.map((r) => (
              <tr key={r.shop.id} className="border-b border-sand-100">
                <ShopCell row={r} />
                <td className="num py-3 pr-4">{money(r.money.labourCents, c)}</td>
                <td className="num py-3 pr-4">{money(r.money.partsCents, c)}</td>
                <td className="num py-3 pr-4">{money(r.money.discountCents, c)}</td>
                <td className="num py-3 pr-4 font-medium">{money(r.money.billedCents, c)}</td>
                <td className="num py-3 pr-4">{rateBp(r.royaltyRateBp)}</td>
                <td className="num py-3 pr-4 font-medium">{money(r.royaltyCents, c)}</td>
                <td className="py-3">
                  <InvoiceBadge row={r} />
                </td>
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <TotalsCell totals={t} />
              <td className="num py-3 pr-4">{money(t.money.labourCents, c)}</td>
              <td className="num py-3 pr-4">{money(t.money.partsCents, c)}</td>
              <td className="num py-3 pr-4">{money(t.money.discountCents, c)}</td>
              <td className="num py-3 pr-4">{money(t.money.billedCents, c)}</td>
              <td className="num py-3 pr-4">{DASH}</td>
              <td className="num py-3 pr-4">{money(t.royaltyCents, c)}</td>
              <td className="py-3" />
            </tr>
          </tfoot>
        </table>
      </TableFrame>
    </Panel>
  );
}

function WorkTable({ report }: { report: MonthCloseData }) {
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
    <Panel
      title="Work and bench time"
      description="Jobs checked in, ready and collected in the month. Bench hours are those logged on the jobs collected, so revenue per bench hour compares like with like. Ready on time: ready by the promised time, of the jobs ready in the month that had one."
    >
      <TableFrame label="Work and bench time per shop">
        <table className="w-full min-w-[46rem] text-left">
          <caption className="sr-only">Jobs, bench time and on-time share per shop</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              <Th num>Checked in</Th>
              <Th num>Ready</Th>
              <Th num>Collected</Th>
              <Th num>Bench hours</Th>
              <Th num>Revenue per bench hour</Th>
              <Th num>Ready on time</Th>
            </tr>
          </thead>
          <tbody>
            {report.shops.map((r) => (
              <tr key={r.shop.id} className="border-b border-sand-100">
                <ShopCell row={r} />
                {cells(r)}
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <TotalsCell totals={report.totals} />
              {cells(report.totals)}
            </tr>
          </tfoot>
        </table>
      </TableFrame>
    </Panel>
  );
}

function TurnaroundTable({ report }: { report: MonthCloseData }) {
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
    <Panel
      title="Turnaround"
      description="Business hours (opening hours only) for the jobs that became ready in the month: customer turnaround from check-in to ready; bench turnaround without the time waiting on parts. Median and 90th percentile (Hyndman & Fan type 7)."
    >
      <TableFrame label="Turnaround per shop">
        <table className="w-full min-w-[40rem] text-left">
          <caption className="sr-only">Customer and bench turnaround per shop</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              <Th num>Jobs ready</Th>
              <Th num>Customer median</Th>
              <Th num>Customer 90th percentile</Th>
              <Th num>Bench median</Th>
              <Th num>Bench 90th percentile</Th>
            </tr>
          </thead>
          <tbody>
            {report.shops.map((r) => (
              <tr key={r.shop.id} className="border-b border-sand-100">
                <ShopCell row={r} />
                {cells(r)}
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <TotalsCell totals={report.totals} />
              {cells(report.totals)}
            </tr>
          </tfoot>
        </table>
      </TableFrame>
    </Panel>
  );
}

function QualityTable({ report }: { report: MonthCloseData }) {
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
    <Panel
      title="Quality"
      description={`Comeback rate of the jobs collected in the month whose ${report.warrantyDays}-day warranty window had closed by ${utc(report.asOf)}, plus those that already came back. Jobs still inside their window are left out; soon after the month ends that is most of them, so the rate rests on few jobs and leans on the returns: read the interval as well as the rate. Audit rounds decided in the month; corrective actions open at its end.`}
    >
      <TableFrame label="Quality per shop">
        <table className="w-full min-w-[48rem] text-left">
          <caption className="sr-only">Comebacks, audits and corrective actions per shop</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <Th>Shop</Th>
              <Th num>Comeback rate</Th>
              <Th num>95% Wilson interval</Th>
              <Th num>Audit rounds</Th>
              <Th num>Lots rejected</Th>
              <Th num>Audit failures</Th>
              <Th num>Open corrective actions</Th>
            </tr>
          </thead>
          <tbody>
            {report.shops.map((r) => (
              <tr key={r.shop.id} className="border-b border-sand-100">
                <ShopCell row={r} />
                {cells(r)}
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <TotalsCell totals={report.totals} />
              {cells(report.totals)}
            </tr>
          </tfoot>
        </table>
      </TableFrame>
    </Panel>
  );
}

function Definitions({ report }: { report: MonthCloseData }) {
  return (
    <p className="max-w-4xl text-slate-600">
      Each shop’s {report.label} runs from midnight on the 1st to midnight on the 1st of the next
      month in the shop’s own time zone. Totals pool the jobs of every shop shown; the royalty total
      is the sum of the shops’ rounded royalties, as invoiced. The CSV carries the same figures with
      a currency column and decimal amounts.
    </p>
  );
}

function History({ report }: { report: MonthCloseData }) {
  return (
    <Panel title="Close history" description="Every close of the month, newest first.">
      <ul className="space-y-3">
        {report.history.map((h) => (
          <li key={h.id} className="rounded-md border border-sand-200 px-4 py-3">
            <p className="font-medium text-slate-900">
              Closed {utc(h.closedAt)}
              {h.closedBy ? ` by ${h.closedBy}` : ''}
            </p>
            {h.reopenedAt ? (
              <p className="mt-1 text-slate-700">
                Reopened {utc(h.reopenedAt)}
                {h.reopenedBy ? ` by ${h.reopenedBy}` : ''}: “{h.reopenReason}”
              </p>
            ) : (
              <p className="mt-1 text-slate-700">The standing close.</p>
            )}
          </li>
        ))}
      </ul>
    </Panel>
  );
}
