'use client';

import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useRouter } from 'next/navigation';
import { useId, useState } from 'react';
import { Panel } from '~/components/ui';
import { ProblemError, sendJson } from '~/lib/api-client';
import { auditKeys, planPreviewQuery } from '~/lib/queries/audits';
import {
  AQL_CHOICES,
  INSPECTION_LEVELS,
  roundPeriodError,
  type InspectionLevelValue,
} from '~/lib/audits';
import { localDateError } from '~/lib/dates';
import type { PlannedRound } from '~/server/audits/plan';
import { SeverityBadge } from './badges';
import { formatLocalDate, formatPeriod, formLabel } from './format';
import { DECISION_LABELS, levelLabel } from './labels';

interface Props {
  shops: { id: number; name: string; timeZone: string; today: string }[];
  auditors: { id: number; name: string; email: string }[];
  defaults: { shopId: number; from: string; to: string; aql: number; level: InspectionLevelValue };
  form: { id: number; version: number; title: string } | null;
}

const input =
  'mt-1 block min-h-11 w-full rounded-md border border-slate-400 bg-white px-3 text-base text-slate-900';

export function PlanForm({ shops, auditors, defaults, form }: Props) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const id = useId();
  const [shopId, setShopId] = useState(String(defaults.shopId));
  const [from, setFrom] = useState(defaults.from);
  const [to, setTo] = useState(defaults.to);
  const [aql, setAql] = useState(String(defaults.aql));
  const [level, setLevel] = useState<InspectionLevelValue>(defaults.level);
  const [auditorId, setAuditorId] = useState(auditors.length === 1 ? String(auditors[0]!.id) : '');
  const [auditorError, setAuditorError] = useState<string | null>(null);

  // The same checks as the preview's query schema, without zod in the page: the shop, AQL and
  // level come from lists, so only the dates can be wrong.
  const errors = {
    from: localDateError(from),
    to: localDateError(to) ?? (localDateError(from) ? null : roundPeriodError(from, to)),
  };
  const valid = !errors.from && !errors.to;
  const fieldError = (field: 'from' | 'to') => errors[field] ?? undefined;
  const preview = useQuery({
    ...planPreviewQuery(
      valid
        ? { shopId: Number(shopId), from, to, aql: Number(aql), level }
        : { shopId: defaults.shopId, from: defaults.from, to: defaults.to },
    ),
    enabled: valid,
    placeholderData: keepPreviousData,
  });
  const shop = shops.find((s) => String(s.id) === shopId);

  const plan = useMutation({
    mutationFn: () =>
      sendJson<PlannedRound>('POST', '/api/audit-rounds', {
        shopId: Number(shopId),
        from,
        to,
        aql: Number(aql),
        level,
        auditorId: Number(auditorId),
      }),
    onSuccess: async (round) => {
      await queryClient.invalidateQueries({ queryKey: auditKeys.all });
      router.push(`/audits/${round.id}`);
    },
  });

  const data = valid ? preview.data : undefined;
  const canDraw = Boolean(data && !data.blocked && data.plan && !preview.isPlaceholderData);

  const submit = (event: React.FormEvent) => {
    event.preventDefault();
    if (!auditorId) {
      setAuditorError('Choose the auditor who will score the sample');
      return;
    }
    setAuditorError(null);
    if (canDraw) plan.mutate();
  };

  const serverFieldErrors =
    plan.error instanceof ProblemError ? (plan.error.problem.errors ?? []) : [];

  return (
    <form onSubmit={submit} noValidate className="grid gap-6 lg:grid-cols-[22rem_minmax(0,1fr)]">
      <Panel title="Shop and period" id={`${id}-inputs`}>
        <div className="space-y-4">
          <div>
            <label htmlFor={`${id}-shop`} className="font-medium">
              Shop
            </label>
            <select
              id={`${id}-shop`}
              className={input}
              value={shopId}
              onChange={(e) => setShopId(e.target.value)}
            >
              {shops.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
            {shop && (
              <p className="mt-1 text-sm text-slate-600">
                Dates are local to the shop ({shop.timeZone.replace('_', ' ')}); today there is{' '}
                {formatLocalDate(shop.today)}.
              </p>
            )}
          </div>
          <div className="grid grid-cols-2 gap-3">
            <DateField
              id={`${id}-from`}
              label="From"
              value={from}
              onChange={setFrom}
              error={fieldError('from')}
            />
            <DateField
              id={`${id}-to`}
              label="To"
              value={to}
              onChange={setTo}
              error={fieldError('to')}
            />
          </div>
          <div className="grid grid-cols-2 gap-3">
            <div>
              <label htmlFor={`${id}-aql`} className="font-medium">
                AQL (%)
              </label>
              <select
                id={`${id}-aql`}
                className={input}
                value={aql}
                onChange={(e) => setAql(e.target.value)}
              >
                {AQL_CHOICES.map((a) => (
                  <option key={a} value={String(a)}>
                    {a}
                    {a === defaults.aql ? ' (default)' : ''}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor={`${id}-level`} className="font-medium">
                Inspection level
              </label>
              <select
                id={`${id}-level`}
                className={input}
                value={level}
                onChange={(e) => setLevel(e.target.value as InspectionLevelValue)}
              >
                {INSPECTION_LEVELS.map((l) => (
                  <option key={l} value={l}>
                    {levelLabel(l)}
                    {l === defaults.level ? ' (default)' : ''}
                  </option>
                ))}
              </select>
            </div>
          </div>
          <div>
            <label htmlFor={`${id}-auditor`} className="font-medium">
              Auditor
            </label>
            <select
              id={`${id}-auditor`}
              className={input}
              value={auditorId}
              aria-invalid={auditorError ? true : undefined}
              aria-describedby={auditorError ? `${id}-auditor-error` : `${id}-auditor-hint`}
              onChange={(e) => {
                setAuditorId(e.target.value);
                setAuditorError(null);
              }}
            >
              <option value="">Choose an auditor…</option>
              {auditors.map((a) => (
                <option key={a.id} value={a.id}>
                  {a.name}
                </option>
              ))}
            </select>
            {auditorError ? (
              <p id={`${id}-auditor-error`} className="mt-1 text-sm font-medium text-brick-700">
                {auditorError}
              </p>
            ) : (
              <p id={`${id}-auditor-hint`} className="mt-1 text-sm text-slate-600">
                They are e-mailed when the round is planned.
              </p>
            )}
          </div>
          {form && (
            <p className="text-sm text-slate-600">
              Scored against {formLabel(form.title, form.version)}.
            </p>
          )}
        </div>
      </Panel>

      <Panel
        title="Sampling plan"
        id={`${id}-plan`}
        description="ISO 2859-1 single sampling (= ANSI/ASQ Z1.4, MIL-STD-105E)."
      >
        <div aria-live="polite" aria-busy={preview.isFetching}>
          {!valid ? (
            <p className="text-slate-700">Correct the period to see the plan.</p>
          ) : preview.isPending ? (
            <p className="text-slate-600">Counting the lot…</p>
          ) : preview.isError ? (
            <p role="alert" className="text-brick-700">
              Could not work out the plan: {preview.error.message}
            </p>
          ) : data ? (
            <div className="space-y-5">
              <p className="text-lg">
                <strong className="num text-2xl">{data.lotSize}</strong>{' '}
                {data.lotSize === 1 ? 'job' : 'jobs'} became ready at {data.shop.name},{' '}
                {formatPeriod(data.from, data.to)}.
              </p>
              <div>
                <SeverityBadge severity={data.severity} />
                <p className="mt-2 text-slate-700">{data.severityReason}</p>
                {data.undecided > 0 && (
                  <p className="mt-1 text-sm text-slate-600">
                    {data.undecided} earlier {data.undecided === 1 ? 'round is' : 'rounds are'} not
                    decided yet; {data.undecided === 1 ? 'its' : 'their'} outcome can change the
                    severity of later rounds.
                  </p>
                )}
              </div>
              {data.plan && (
                <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
                  <Figure
                    label="Code letter"
                    value={data.plan.codeLetter}
                    hint={`Table I, level ${levelLabel(data.level)}`}
                  />
                  <Figure
                    label="Sample size"
                    value={String(data.plan.sampleSize)}
                    hint={
                      data.plan.hundredPercent
                        ? 'Whole lot (100% inspection)'
                        : data.plan.planCodeLetter !== data.plan.codeLetter
                          ? `Letter ${data.plan.planCodeLetter}, following the table’s arrow`
                          : `Table ${data.plan.table}`
                    }
                  />
                  <Figure
                    label="Accept (Ac)"
                    value={String(data.plan.accept)}
                    hint={`Accept with ${data.plan.accept} or fewer failures`}
                  />
                  <Figure
                    label="Reject (Re)"
                    value={String(data.plan.reject)}
                    hint={`Reject at ${data.plan.reject} or more`}
                  />
                </dl>
              )}
              {data.history.length > 0 && (
                <div>
                  <h3 className="font-semibold">The shop’s decided rounds</h3>
                  <ol className="mt-1 flex flex-wrap gap-2 text-sm">
                    {data.history.map((h) => (
                      <li key={h.roundId} className="rounded border border-sand-300 px-2 py-1">
                        #{h.roundId} {formatPeriod(h.periodStart, h.periodEnd)}:{' '}
                        {DECISION_LABELS[h.decision].replace('Lot ', '')}
                      </li>
                    ))}
                  </ol>
                </div>
              )}
              {data.blocked && (
                <p
                  role="alert"
                  className="rounded-md border border-brick-300 bg-brick-50 p-3 text-brick-800"
                >
                  {data.blocked}
                </p>
              )}
            </div>
          ) : null}
        </div>
        <div className="mt-6 border-t border-sand-200 pt-5">
          <p className="mb-3 text-sm text-slate-600">
            Drawing uses a fresh random seed. The seed and the lot (job ids in ascending order) are
            stored with the round, so anyone can redraw the same sample and see that no one picked
            the jobs. Periods of a shop’s rounds cannot overlap.
          </p>
          <button
            type="submit"
            disabled={!canDraw || plan.isPending}
            className="inline-flex min-h-11 items-center rounded-md bg-sea-700 px-5 font-semibold text-white hover:bg-sea-800 disabled:cursor-not-allowed disabled:bg-slate-400"
          >
            {plan.isPending ? 'Drawing…' : 'Draw the sample and assign'}
          </button>
          {plan.isError && (
            <div role="alert" className="mt-3 text-brick-700">
              <p>{plan.error.message}</p>
              {serverFieldErrors.length > 0 && (
                <ul className="list-disc pl-5">
                  {serverFieldErrors.map((e) => (
                    <li key={e.field}>{e.message}</li>
                  ))}
                </ul>
              )}
            </div>
          )}
        </div>
      </Panel>
    </form>
  );
}

function DateField(props: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  error?: string;
}) {
  return (
    <div>
      <label htmlFor={props.id} className="font-medium">
        {props.label}
      </label>
      <input
        id={props.id}
        type="date"
        className={input}
        value={props.value}
        onChange={(e) => props.onChange(e.target.value)}
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? `${props.id}-error` : undefined}
      />
      {props.error && (
        <p id={`${props.id}-error`} className="mt-1 text-sm font-medium text-brick-700">
          {props.error}
        </p>
      )}
    </div>
  );
}

function Figure(props: { label: string; value: string; hint: string }) {
  return (
    <div className="rounded-md border border-sand-200 bg-sand-50 px-3 py-2">
      <dt className="text-sm font-medium text-slate-600">{props.label}</dt>
      <dd className="num text-left text-3xl font-semibold">{props.value}</dd>
      <dd className="text-sm text-slate-600">{props.hint}</dd>
    </div>
  );
}
