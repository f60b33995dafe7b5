'use client';

import { useState } from 'react';
import { fetchJson, ProblemError } from '~/lib/api-client';

const button =
  'inline-flex min-h-11 items-center justify-center rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:cursor-not-allowed disabled:border-slate-300 disabled:text-slate-600';

export interface UndeliveredRow {
  id: number;
  to: string;
  subject: string;
  attempts: number;
  lastError: string | null;
  /** Already formatted in UTC on the server. */
  queued: string;
}

const message = (error: unknown) =>
  error instanceof ProblemError
    ? (error.problem.detail ?? error.message)
    : error instanceof Error
      ? error.message
      : 'Something went wrong.';

/** The owner's switch for the weekly service-reminder run. */
export function WeeklyRemindersSwitch({ initial }: { initial: boolean }) {
  const [on, setOn] = useState(initial);
  const [saving, setSaving] = useState(false);
  const [status, setStatus] = useState<string | null>(null);
  const change = async (next: boolean) => {
    // The box shows the choice at once; a refusal puts it back.
    setOn(next);
    setSaving(true);
    setStatus(null);
    try {
      const saved = await fetchJson<{ weeklyReminders: boolean }>('/api/settings/reminders', {
        method: 'PUT',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ weeklyReminders: next }),
      });
      setOn(saved.weeklyReminders);
      setStatus(saved.weeklyReminders ? 'Weekly reminders are on.' : 'Weekly reminders are off.');
    } catch (error) {
      setOn(!next);
      setStatus(message(error));
    } finally {
      setSaving(false);
    }
  };
  return (
    <div>
      <label className="flex min-h-11 items-center gap-3 font-medium text-slate-900">
        <input
          type="checkbox"
          className="h-5 w-5 accent-sea-700"
          checked={on}
          disabled={saving}
          onChange={(e) => void change(e.target.checked)}
        />
        Send each shop’s service reminders on Monday morning
      </label>
      <p className="text-slate-600">
        At 08:00 in the shop’s time zone, the reminders due in the next four weeks go to customers
        who agreed to them. Off, reminders go out only from the reminders page.
      </p>
      <p aria-live="polite" className="mt-1 text-sm text-slate-700">
        {status}
      </p>
    </div>
  );
}

/** Messages that gave up after every retry, with their last error and a resend button. */
export function UndeliveredMail({ rows }: { rows: UndeliveredRow[] }) {
  const [resent, setResent] = useState<Record<number, string>>({});
  const resend = async (row: UndeliveredRow) => {
    try {
      await fetchJson('/api/mail/resend', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ id: row.id }),
      });
      setResent((r) => ({ ...r, [row.id]: 'Back in the outbox' }));
    } catch (error) {
      setResent((r) => ({ ...r, [row.id]: message(error) }));
    }
  };
  if (rows.length === 0) return <p className="text-slate-600">Every message was delivered.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[44rem] text-left">
        <caption className="sr-only">Undelivered mail</caption>
        <thead>
          <tr className="border-b border-sand-300 text-sm text-slate-600">
            <th scope="col" className="py-2 pr-4 font-medium">
              To
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Subject
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Queued (UTC)
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Last error
            </th>
            <th scope="col" className="py-2 font-medium">
              <span className="sr-only">Action</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.id} className="border-b border-sand-100 align-top">
              <td className="py-3 pr-4">{row.to}</td>
              <th scope="row" className="py-3 pr-4 font-medium">
                {row.subject}
              </th>
              <td className="py-3 pr-4">{row.queued}</td>
              <td className="py-3 pr-4 text-sm text-slate-700">
                {row.lastError ?? '–'} ({row.attempts} attempts)
              </td>
              <td className="py-3">
                {resent[row.id] ? (
                  <span aria-live="polite" className="text-sm text-slate-700">
                    {resent[row.id]}
                  </span>
                ) : (
                  <button type="button" className={button} onClick={() => void resend(row)}>
                    Resend
                    <span className="sr-only">
                      {' '}
                      “{row.subject}” to {row.to}
                    </span>
                  </button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
