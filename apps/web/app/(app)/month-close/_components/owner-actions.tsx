'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useId, useState, type FormEvent } from 'react';
import { Panel } from '~/components/ui';
import { ProblemError } from '~/lib/api-client';
import {
  closeMonthRequest,
  issueInvoicesRequest,
  monthCloseKeys,
  reopenMonthRequest,
  type IssueData,
  type MonthCloseData,
} from '~/lib/queries/month-close';
import { primary, secondary } from './controls';
import { n } from './format';

function errorText(error: unknown) {
  if (error instanceof ProblemError) return error.problem.detail ?? error.message;
  return error instanceof Error ? error.message : 'Something went wrong.';
}

/** The owner's close, reopen and invoice actions for the month. */
export function OwnerActions({
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
      store(data);
    },
  });
  const issue = useMutation({
    mutationFn: () => issueInvoicesRequest(report.month),
    onSuccess: (request: IssueData) => {
      const current = queryClient.getQueryData<MonthCloseData>(key);
      if (current) store({ ...current, invoicing: request });
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  const submitReopen = async (event: FormEvent) => {
    event.preventDefault();
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { reopenInput } = await import('~/lib/validators/month-close');
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
  const running = Boolean(report.invoicing && !report.invoicing.doneAt);
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
              disabled={issue.isPending || running || !paymentsReady}
            >
              {issue.isPending || running
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
        {report.status === 'closed' && report.invoicing && (
          <p className="mt-4 rounded-md border border-sea-200 bg-sea-50 px-4 py-3 text-sea-900">
            {running
              ? `Issuing royalty invoices: ${n(invoiced)} of ${n(due)} shops done.`
              : `Invoices issued: ${n(invoiced)} of ${n(due)} shops with a royalty due have one.`}
          </p>
        )}
      </div>
      {failure && (
        <p role="alert" className="mt-4 text-brick-700">
          {errorText(failure)}
        </p>
      )}
    </Panel>
  );
}
