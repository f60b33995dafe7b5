'use client';

import { useQuery } from '@tanstack/react-query';
import { Stat } from '~/components/ui';
import { monthCloseQuery, type MonthCloseData } from '~/lib/queries/month-close';
import { CloseHistory } from './close-history';
import { Differences } from './differences';
import { MoneyTable, QualityTable, TurnaroundTable, WorkTable } from './figure-tables';
import { money, n } from './format';
import { MonthToolbar } from './month-toolbar';
import { OwnerActions } from './owner-actions';

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
      <MonthToolbar month={props.month} months={props.months} report={data} />
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
      {data.history.length > 0 && <CloseHistory report={data} />}
    </div>
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
