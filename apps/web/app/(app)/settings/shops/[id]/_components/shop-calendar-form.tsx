'use client';

import { useMutation } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { SaveBar } from '~/components/save-bar';
import { Panel } from '~/components/ui';
import { fetchJson, ProblemError } from '~/lib/api-client';
import {
  formatDayHours,
  parseDayHours,
  WEEKDAY_LABELS,
  WEEKDAYS,
  type ShopCalendarInput,
  type WeekdayValue,
} from '~/lib/validators/shops';
import type { SavedShopCalendar, ShopCalendarView } from '~/server/shops/calendar';

const field =
  'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3 aria-invalid:border-brick-600';

export function ShopCalendarForm({ initial }: { initial: ShopCalendarView }) {
  const uid = useId();
  const [hours, setHours] = useState<Record<WeekdayValue, string>>(
    () =>
      Object.fromEntries(WEEKDAYS.map((d) => [d, formatDayHours(initial.weekly[d])])) as Record<
        WeekdayValue,
        string
      >,
  );
  const [closed, setClosed] = useState(initial.closedDates.join('\n'));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useMutation({
    mutationFn: (body: ShopCalendarInput) =>
      fetchJson<SavedShopCalendar>(`/api/shops/${initial.shop.id}/calendar`, {
        method: 'PUT',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify(body),
      }),
  });

  // The API's field errors, each under the field it belongs to: a span under its weekday, a date
  // under the closed dates, named.
  const server: Record<string, string> = {};
  if (save.error instanceof ProblemError)
    for (const e of save.error.problem.errors ?? []) {
      const field = e.field.replace(/^body\./, '');
      const date = /^closedDates\.(\d+)$/.exec(field);
      if (date) {
        const value = save.variables?.closedDates[Number(date[1])];
        server.closedDates ??= value ? `${value}: ${e.message}` : e.message;
      } else
        server[field.replace(/^(weekly\.\w+)\..*$/, '$1').replace(/^weekly\./, '')] ??= e.message;
    }
  const all = { ...server, ...errors };
  // Anything the API refused that belongs to no field on the page.
  const onPage = new Set<string>([...WEEKDAYS, 'closedDates']);
  const stray = Object.entries(server)
    .filter(([k]) => !onPage.has(k))
    .map(([, message]) => message);

  const submit = (event: React.FormEvent) => {
    event.preventDefault();
    const found: Record<string, string> = {};
    const weekly = {} as ShopCalendarInput['weekly'];
    for (const d of WEEKDAYS) {
      const parsed = parseDayHours(hours[d]);
      if ('error' in parsed) found[d] = parsed.error;
      else weekly[d] = parsed.spans;
    }
    const dates = closed
      .split(/[\s,]+/)
      .map((s) => s.trim())
      .filter(Boolean);
    const bad = dates.find((s) => !/^\d{4}-\d{2}-\d{2}$/.test(s));
    if (bad) found.closedDates = `“${bad}” is not a date in the form YYYY-MM-DD.`;
    setErrors(found);
    if (Object.keys(found).length > 0) return;
    save.mutate({ weekly, closedDates: [...new Set(dates)] });
  };
  const change = (key: string) => {
    if (errors[key]) setErrors(({ [key]: _gone, ...rest }) => rest);
    if (save.isError || save.isSuccess) save.reset();
  };
  const done = save.data
    ? `Saved. Turnaround computed again for ${save.data.recomputed.toLocaleString('en-US')} finished ${save.data.recomputed === 1 ? 'job' : 'jobs'}; ${save.data.changed.toLocaleString('en-US')} changed.`
    : '';

  return (
    <form onSubmit={submit} noValidate className="space-y-8">
      <Panel
        title="Weekly hours"
        description="Local times, 24-hour clock. Several spans a day are separated by commas (09:00–12:30, 13:30–17:00); leave a day empty when the shop is closed."
      >
        <div className="grid gap-4 sm:grid-cols-2">
          {WEEKDAYS.map((d) => {
            const id = `${uid}-${d}`;
            return (
              <div key={d}>
                <label htmlFor={id} className="font-medium">
                  {WEEKDAY_LABELS[d]}
                </label>
                <input
                  id={id}
                  name={d}
                  value={hours[d]}
                  placeholder="Closed"
                  autoComplete="off"
                  aria-invalid={all[d] ? true : undefined}
                  aria-describedby={all[d] ? `${id}-error` : undefined}
                  onChange={(e) => {
                    setHours((h) => ({ ...h, [d]: e.target.value }));
                    change(d);
                  }}
                  className={field}
                />
                {all[d] && (
                  <p id={`${id}-error`} className="mt-1 text-brick-700">
                    {all[d]}
                  </p>
                )}
              </div>
            );
          })}
        </div>
      </Panel>
      <Panel
        title="Closed dates"
        description="Holidays and other days the shop stays shut although its weekly hours say open: one date per line, YYYY-MM-DD."
      >
        <label htmlFor={`${uid}-closed`} className="font-medium">
          Closed dates
        </label>
        <textarea
          id={`${uid}-closed`}
          name="closedDates"
          rows={6}
          value={closed}
          aria-invalid={all.closedDates ? true : undefined}
          aria-describedby={all.closedDates ? `${uid}-closed-error` : undefined}
          onChange={(e) => {
            setClosed(e.target.value);
            change('closedDates');
          }}
          className={`${field} py-2 font-mono`}
        />
        {all.closedDates && (
          <p id={`${uid}-closed-error`} className="mt-1 text-brick-700">
            {all.closedDates}
          </p>
        )}
      </Panel>
      <SaveBar label="Save the opening hours" pending={save.isPending} done={done}>
        {save.isError && (stray.length > 0 || Object.keys(server).length === 0) && (
          <p role="alert" className="font-medium text-brick-700">
            Not saved: {stray.length > 0 ? stray.join(' ') : save.error.message}
          </p>
        )}
      </SaveBar>
    </form>
  );
}
