'use client';

import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useEffect, useId, useState } from 'react';
import { Empty, Panel, Stat } from '~/components/ui';
import { ProblemError } from '~/lib/api-client';
import {
  dueRemindersQuery,
  reminderBatchesQuery,
  reminderBatchQuery,
  reminderKeys,
  sendRemindersRequest,
  type DueData,
} from '~/lib/queries/reminders';
import { REMINDER_WEEKS } from '~/lib/reminders';

type Reminder = DueData['reels'][number]['reminder'];

const field =
  'min-h-11 rounded-md border border-sand-300 bg-white px-3 text-slate-900 shadow-sm focus-visible:border-sea-600';
const primary =
  'inline-flex min-h-11 items-center justify-center rounded-md bg-sea-700 px-4 font-medium text-white shadow-sm hover:bg-sea-800 disabled:cursor-not-allowed disabled:bg-sand-200 disabled:text-slate-700 disabled:shadow-none';
const secondary =
  'inline-flex min-h-11 items-center justify-center rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50';

const dayFormat = new Intl.DateTimeFormat('en-GB', {
  day: 'numeric',
  month: 'short',
  year: 'numeric',
  timeZone: 'UTC',
});
const day = (local: string) => {
  const [y, m, d] = local.split('-').map(Number);
  return dayFormat.format(new Date(Date.UTC(y!, m! - 1, d!)));
};
/** An instant in the shop's own zone, the same on the server and in the browser. */
const atShop = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat('en-GB', {
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZone,
  }).format(new Date(iso));
const count = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

const REMINDER_LABELS: Record<Reminder, string> = {
  to_send: 'Will be sent',
  sent: 'Sent',
  no_consent: 'No consent',
  no_email: 'No e-mail address',
};
const REMINDER_STYLES: Record<Reminder, string> = {
  to_send: 'bg-brass-50 text-brass-800 ring-brass-200',
  sent: 'bg-sea-700 text-white ring-sea-700',
  no_consent: 'bg-white text-slate-700 ring-slate-300',
  no_email: 'bg-white text-slate-700 ring-slate-300',
};

export function RemindersView({ shopId, initialWeeks }: { shopId: number; initialWeeks: number }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const id = useId();
  const [weeks, setWeeks] = useState(initialWeeks);
  const [confirming, setConfirming] = useState(false);
  const [batchId, setBatchId] = useState<number | null>(null);
  const [show, setShow] = useState<'all' | Reminder | 'not_reminded'>('all');
  const due = useQuery(dueRemindersQuery(shopId, weeks));
  const batches = useQuery(reminderBatchesQuery(shopId));
  const batch = useQuery({ ...reminderBatchQuery(batchId ?? 0), enabled: batchId !== null });
  const send = useMutation({
    mutationFn: () => sendRemindersRequest(shopId, weeks),
    onSuccess: ({ batch: started }) => {
      setConfirming(false);
      queryClient.setQueryData(reminderKeys.batch(started.id), started);
      setBatchId(started.id);
    },
  });
  const status = batch.data?.status;
  useEffect(() => {
    if (status && status !== 'running')
      void queryClient.invalidateQueries({ queryKey: reminderKeys.all });
  }, [status, queryClient]);

  const chooseWeeks = (value: number) => {
    setWeeks(value);
    setConfirming(false);
    router.replace(`/reminders?weeks=${value}`, { scroll: false });
  };

  if (due.isPending) return <p className="text-slate-600">Loading the reels due…</p>;
  if (due.isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load the reels due: {due.error.message}
      </p>
    );
  const report = due.data;
  const toSend = report.counts.to_send;
  const running = status === 'running';
  const progress = batch.data;
  const handled = progress ? progress.sent + progress.skipped + progress.failed : 0;
  const shown = report.reels.filter((r) =>
    show === 'all'
      ? true
      : show === 'not_reminded'
        ? r.reminder === 'no_consent' || r.reminder === 'no_email'
        : r.reminder === show,
  );

  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-end justify-between gap-4 rounded-lg border border-sand-200 bg-white p-5 shadow-sm">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-weeks`} className="text-sm font-medium text-slate-700">
            Due within
          </label>
          <select
            id={`${id}-weeks`}
            value={weeks}
            onChange={(e) => chooseWeeks(Number(e.target.value))}
            className={field}
          >
            {REMINDER_WEEKS.map((w) => (
              <option key={w} value={w}>
                {w} weeks
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-wrap items-center gap-3">
          {!confirming ? (
            <button
              type="button"
              className={primary}
              disabled={toSend === 0 || running || send.isPending}
              onClick={() => setConfirming(true)}
            >
              {toSend ? `Send ${count(toSend, 'reminder')}` : 'No reminders to send'}
            </button>
          ) : (
            <div className="flex flex-wrap items-center gap-3 rounded-md border border-brass-300 bg-brass-50 p-3">
              <p className="font-medium text-slate-900">
                Send {count(toSend, 'reminder e-mail')} now?
              </p>
              <button
                type="button"
                className={primary}
                onClick={() => send.mutate()}
                disabled={send.isPending}
              >
                {send.isPending ? 'Starting…' : 'Yes, send'}
              </button>
              <button type="button" className={secondary} onClick={() => setConfirming(false)}>
                Cancel
              </button>
            </div>
          )}
        </div>
      </div>

      {progress && (
        <section
          aria-labelledby={`${id}-progress`}
          className="rounded-lg border border-sea-200 bg-sea-50 p-5"
        >
          <h2 id={`${id}-progress`} className="font-semibold text-sea-900">
            {progress.status === 'running'
              ? 'Sending reminders…'
              : progress.status === 'done'
                ? 'Reminders sent'
                : 'Sending stopped'}
          </h2>
          <div
            role="progressbar"
            aria-labelledby={`${id}-progress`}
            aria-valuemin={0}
            aria-valuemax={progress.total}
            aria-valuenow={handled}
            aria-valuetext={`${handled} of ${progress.total}`}
            className="mt-3 h-3 overflow-hidden rounded-full bg-white ring-1 ring-sea-200"
          >
            <div
              className="h-full bg-sea-700 transition-[width]"
              style={{ width: `${progress.total ? (100 * handled) / progress.total : 100}%` }}
            />
          </div>
          <p className="mt-2 text-sea-900" aria-live="polite">
            {handled} of {progress.total} handled: {progress.sent} sent
            {progress.skipped
              ? `, ${progress.skipped} skipped (already reminded or no longer consenting)`
              : ''}
            {progress.failed ? `, ${progress.failed} failed` : ''}.
          </p>
        </section>
      )}
      {send.error && (
        <p role="alert" className="text-brick-700">
          {send.error instanceof ProblemError
            ? (send.error.problem.detail ?? send.error.message)
            : send.error.message}
        </p>
      )}

      <dl className="grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Stat
          label="Reels due"
          value={report.counts.due}
          hint={`By ${day(report.horizon)}, and any due in the last two weeks`}
        />
        <Stat label="Will get a reminder" value={toSend} hint="Consented, with an e-mail address" />
        <Stat label="Already reminded" value={report.counts.sent} hint="For the same due date" />
        <Stat
          label="Not reminded"
          value={report.counts.no_consent + report.counts.no_email}
          hint={`${report.counts.no_consent} without consent, ${report.counts.no_email} without e-mail`}
        />
      </dl>

      <Panel
        title={`Reels due by ${day(report.horizon)}`}
        description={`Earliest first, as of ${day(report.today)} at ${report.shop.name}. Only customers who agreed to reminders get one, each with a link to stop them.`}
      >
        {report.reels.length > 0 && (
          <div className="mb-4 flex flex-col gap-1">
            <label htmlFor={`${id}-show`} className="text-sm font-medium text-slate-700">
              Show
            </label>
            <select
              id={`${id}-show`}
              value={show}
              onChange={(e) => setShow(e.target.value as typeof show)}
              className={`${field} self-start`}
            >
              <option value="all">All {report.counts.due} reels due</option>
              <option value="to_send">Will get a reminder ({report.counts.to_send})</option>
              <option value="sent">Already reminded ({report.counts.sent})</option>
              <option value="not_reminded">
                Not reminded: no consent or no e-mail (
                {report.counts.no_consent + report.counts.no_email})
              </option>
            </select>
          </div>
        )}
        {report.reels.length === 0 ? (
          <Empty>No reel is due in the next {weeks} weeks.</Empty>
        ) : shown.length === 0 ? (
          <Empty>None of the reels due is in this group.</Empty>
        ) : (
          <div
            className="overflow-x-auto"
            role="region"
            aria-label="Reels due for a service"
            tabIndex={0}
          >
            <table className="w-full min-w-[48rem] text-left">
              <caption className="sr-only">
                Reels due for a service, with the customer and the reminder
              </caption>
              <thead>
                <tr className="border-b border-sand-300 text-sm text-slate-600">
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Due
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Customer
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Reel
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Use
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Last service
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Reminder
                  </th>
                </tr>
              </thead>
              <tbody>
                {shown.map((r) => (
                  <tr key={r.reelId} className="border-b border-sand-100">
                    <td className="py-3 pr-4 whitespace-nowrap tabular-nums">
                      {day(r.dueOn)}
                      {r.overdue && (
                        <span className="block text-sm font-medium text-amber-900">Overdue</span>
                      )}
                    </td>
                    <th scope="row" className="py-3 pr-4 font-medium">
                      {r.customer.name}
                    </th>
                    <td className="py-3 pr-4">{r.reel}</td>
                    <td className="py-3 pr-4">
                      {r.useProfile === 'heavy' ? 'Heavy' : 'Light'},{' '}
                      {r.water === 'salt' ? 'salt' : 'fresh'}
                    </td>
                    <td className="py-3 pr-4 whitespace-nowrap tabular-nums">
                      {day(r.lastServicedOn)}
                    </td>
                    <td className="py-3">
                      <span
                        className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-medium whitespace-nowrap ring-1 ring-inset ${REMINDER_STYLES[r.reminder]}`}
                      >
                        {REMINDER_LABELS[r.reminder]}
                        {r.sentAt ? ` ${atShop(r.sentAt, report.shop.timeZone)}` : ''}
                      </span>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>

      <Panel title="Sent batches" description="What was sent, newest first.">
        {!batches.data?.batches.length ? (
          <Empty>No reminders have been sent from this shop yet.</Empty>
        ) : (
          <div
            className="overflow-x-auto"
            role="region"
            aria-label="Sent reminder batches"
            tabIndex={0}
          >
            <table className="w-full min-w-[36rem] text-left">
              <caption className="sr-only">Reminder batches sent from this shop</caption>
              <thead>
                <tr className="border-b border-sand-300 text-sm text-slate-600">
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Started
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    By
                  </th>
                  <th scope="col" className="num py-2 pr-4 font-medium">
                    Sent
                  </th>
                  <th scope="col" className="num py-2 pr-4 font-medium">
                    Skipped
                  </th>
                  <th scope="col" className="num py-2 pr-4 font-medium">
                    Failed
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Status
                  </th>
                </tr>
              </thead>
              <tbody>
                {batches.data.batches.map((b) => (
                  <tr key={b.id} className="border-b border-sand-100">
                    <th scope="row" className="py-3 pr-4 font-medium whitespace-nowrap">
                      {atShop(b.createdAt, report.shop.timeZone)}
                    </th>
                    <td className="py-3 pr-4">{b.createdBy ?? '—'}</td>
                    <td className="num py-3 pr-4">{b.sent}</td>
                    <td className="num py-3 pr-4">{b.skipped}</td>
                    <td className="num py-3 pr-4">{b.failed}</td>
                    <td className="py-3">
                      {b.status === 'running'
                        ? 'Sending'
                        : b.status === 'done'
                          ? 'Done'
                          : 'Stopped'}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Panel>
    </div>
  );
}
