'use client';

import { useState, type FormEvent } from 'react';
import { sendJson } from '~/lib/api-client';
import { Empty, Panel } from '~/components/ui';
import { type JobDetailJson } from '~/lib/queries/jobs';
import { parseMoney } from '~/lib/jobs';
import { formatCents } from '../../../_components/format';
import { ErrorNote } from './error-note';
import { useJobMutation } from './use-job-mutation';

const blank = { name: '', partNumber: '', quantity: '1', unitPrice: '' };
const inputClass =
  'mt-1 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-lg aria-invalid:border-brick-600';

export function PartsPanel({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const [form, setForm] = useState(blank);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const add = useJobMutation(job.id, (body: unknown) =>
    sendJson<JobDetailJson>('POST', `/api/jobs/${job.id}/parts`, body),
  );
  const remove = useJobMutation(job.id, (partId: number) =>
    sendJson<JobDetailJson>('DELETE', `/api/jobs/${job.id}/parts/${partId}`),
  );

  async function onSubmit(event: FormEvent) {
    event.preventDefault();
    // The request schema (and zod with it) loads when a part is first added, not with the page.
    const { partInput } = await import('~/lib/validators/jobs');
    const cents = parseMoney(form.unitPrice);
    const parsed = partInput.safeParse({
      name: form.name,
      partNumber: form.partNumber,
      quantity: /^\d+$/.test(form.quantity.trim()) ? Number(form.quantity) : Number.NaN,
      unitPriceCents: cents,
    });
    const next: Record<string, string> = {};
    if (cents === undefined) next.unitPriceCents = 'Enter a price such as 12.50';
    if (!parsed.success)
      for (const issue of parsed.error.issues) next[String(issue.path[0])] ??= issue.message;
    setErrors(next);
    if (!parsed.success || Object.keys(next).length > 0) return;
    add.mutate(parsed.data, { onSuccess: () => setForm(blank) });
  }

  const field = (key: string) => ({
    'aria-invalid': errors[key] ? true : undefined,
    'aria-describedby': errors[key] ? `part-${key}-error` : undefined,
  });

  return (
    <Panel title="Parts" description="Parts fitted to this reel.">
      {job.parts.length === 0 ? (
        <Empty>No parts on this job yet.</Empty>
      ) : (
        <table className="w-full text-left">
          <caption className="sr-only">Parts on job #{job.id}</caption>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <th scope="col" className="py-2 pr-2 font-medium">
                Part
              </th>
              <th scope="col" className="num py-2 pr-2 font-medium">
                Qty × price
              </th>
              <th scope="col" className="num py-2 font-medium">
                Line
              </th>
              {canWrite && (
                <th scope="col" className="w-0 py-2 font-medium">
                  <span className="sr-only">Remove</span>
                </th>
              )}
            </tr>
          </thead>
          <tbody>
            {job.parts.map((p) => (
              <tr key={p.id} className="border-b border-sand-100 align-top">
                <th scope="row" className="py-2 pr-2 font-medium">
                  {p.name}
                  {p.partNumber && (
                    <span className="block text-sm font-normal text-slate-600">{p.partNumber}</span>
                  )}
                </th>
                <td className="num py-2 pr-2 whitespace-nowrap">
                  {p.quantity} × {formatCents(p.unitPriceCents)}
                </td>
                <td className="num py-2 whitespace-nowrap">{formatCents(p.lineCents)}</td>
                {canWrite && (
                  <td className="py-0.5 pl-1 text-right">
                    <button
                      type="button"
                      onClick={() => remove.mutate(p.id)}
                      disabled={remove.isPending}
                      aria-label={`Remove ${p.name}`}
                      title={`Remove ${p.name}`}
                      className="inline-flex size-11 items-center justify-center rounded-md text-xl text-brick-700 hover:bg-brick-50"
                    >
                      <span aria-hidden="true">×</span>
                    </button>
                  </td>
                )}
              </tr>
            ))}
          </tbody>
          <tfoot>
            <tr className="font-semibold">
              <th scope="row" colSpan={2} className="py-2 pr-2">
                Parts total
              </th>
              <td className="num py-2">{formatCents(job.money.partsCents)}</td>
              {canWrite && <td />}
            </tr>
          </tfoot>
        </table>
      )}
      <ErrorNote error={remove.error} />
      {canWrite && (
        <form onSubmit={onSubmit} noValidate className="mt-5 border-t border-sand-200 pt-5">
          <h3 className="font-semibold text-slate-900">Add a part</h3>
          <div className="mt-2 grid grid-cols-2 gap-3">
            {(
              [
                ['name', 'Part', 'text', undefined],
                ['partNumber', 'Part number (optional)', 'text', undefined],
                ['quantity', 'Quantity', 'text', 'numeric'],
                ['unitPrice', 'Unit price ($)', 'text', 'decimal'],
              ] as const
            ).map(([key, label, type, mode]) => {
              const errorKey = key === 'unitPrice' ? 'unitPriceCents' : key;
              return (
                <div
                  key={key}
                  className={key === 'name' || key === 'partNumber' ? 'col-span-2' : ''}
                >
                  <label htmlFor={`part-${key}`} className="block font-medium text-slate-800">
                    {label}
                  </label>
                  <input
                    id={`part-${key}`}
                    type={type}
                    inputMode={mode}
                    value={form[key]}
                    onChange={(e) => setForm({ ...form, [key]: e.target.value })}
                    {...field(errorKey)}
                    aria-describedby={errors[errorKey] ? `part-${errorKey}-error` : undefined}
                    className={inputClass}
                  />
                  {errors[errorKey] && (
                    <p id={`part-${errorKey}-error`} className="mt-1 text-brick-700">
                      {errors[errorKey]}
                    </p>
                  )}
                </div>
              );
            })}
          </div>
          <button
            type="submit"
            disabled={add.isPending}
            className="mt-4 inline-flex min-h-12 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
          >
            {add.isPending ? 'Adding…' : 'Add part'}
          </button>
          <ErrorNote error={add.error} />
        </form>
      )}
    </Panel>
  );
}
