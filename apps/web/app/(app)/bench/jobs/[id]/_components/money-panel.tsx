'use client';

import { useState } from 'react';
import { sendJson } from '~/lib/api-client';
import { Panel } from '~/components/ui';
import { type JobDetailJson } from '~/lib/queries/jobs';
import { parseMoney } from '~/lib/jobs';
import { formatCents, formatMinutes } from '../../../_components/format';
import { ErrorNote } from './error-note';
import { useJobMutation } from './use-job-mutation';

type Basis = 'bench_time' | 'flat_price';

/** Labour (bench time at the posted rate, or the service's flat price), parts, discount, total. */
export function MoneyPanel({ job, canWrite }: { job: JobDetailJson; canWrite: boolean }) {
  const { money } = job;
  const [discount, setDiscount] = useState((money.discountCents / 100).toFixed(2));
  const [lastDiscount, setLastDiscount] = useState(money.discountCents);
  const [discountError, setDiscountError] = useState<string | null>(null);
  if (money.discountCents !== lastDiscount) {
    setLastDiscount(money.discountCents);
    setDiscount((money.discountCents / 100).toFixed(2));
  }
  const patch = useJobMutation(job.id, (body: { labourBasis?: Basis; discountCents?: number }) =>
    sendJson<JobDetailJson>('PATCH', `/api/jobs/${job.id}`, body),
  );
  const rate = `${formatCents(job.shop.labourRateCents)} an hour`;
  const benchText = `${formatMinutes(job.benchMinutes)} at ${rate}`;

  return (
    <Panel title="Charges">
      {canWrite ? (
        <fieldset>
          <legend className="font-medium text-slate-800">Labour</legend>
          <div className="mt-2 space-y-2">
            {money.flatPriceCents !== null && (
              <BasisChoice
                checked={money.labourBasis === 'flat_price'}
                disabled={patch.isPending}
                onChange={() => patch.mutate({ labourBasis: 'flat_price' })}
                title={`Flat price ${formatCents(money.flatPriceCents)}`}
                hint="This shop’s price for the service"
              />
            )}
            <BasisChoice
              checked={money.labourBasis === 'bench_time'}
              disabled={patch.isPending}
              onChange={() => patch.mutate({ labourBasis: 'bench_time' })}
              title={`Bench time ${formatCents(money.benchChargeCents)}`}
              hint={`${benchText}; follows the time logged`}
            />
          </div>
        </fieldset>
      ) : (
        <p className="text-slate-700">
          {money.labourBasis === 'flat_price'
            ? 'Labour is the shop’s flat price for the service.'
            : money.labourBasis === 'bench_time' && money.labourCents > 0
              ? `Labour is charged by bench time (${benchText}).`
              : money.labourCents === 0
                ? 'No labour charged yet.'
                : 'Labour as recorded for this job.'}
        </p>
      )}
      <dl className="mt-5 space-y-2 text-lg">
        <Line label="Labour" cents={money.labourCents} />
        <Line label="Parts" cents={money.partsCents} />
        <div className="flex items-center justify-between gap-3">
          <dt>Discount</dt>
          <dd className="num">
            {canWrite ? (
              <form
                className="flex items-center justify-end gap-2"
                onSubmit={(e) => {
                  e.preventDefault();
                  const cents = parseMoney(discount);
                  if (cents === undefined) {
                    setDiscountError('Enter an amount such as 5.00');
                    return;
                  }
                  setDiscountError(null);
                  patch.mutate({ discountCents: cents });
                }}
              >
                <label htmlFor="discount" className="sr-only">
                  Discount in dollars
                </label>
                <span aria-hidden="true">−$</span>
                <input
                  id="discount"
                  inputMode="decimal"
                  value={discount}
                  onChange={(e) => setDiscount(e.target.value)}
                  aria-invalid={discountError ? true : undefined}
                  aria-describedby={discountError ? 'discount-error' : undefined}
                  className="num min-h-11 w-24 rounded-md border border-slate-400 bg-white px-2"
                />
                <button
                  type="submit"
                  disabled={patch.isPending}
                  className="min-h-11 rounded-md border border-sea-700 px-3 text-base font-semibold text-sea-800 hover:bg-sea-50"
                >
                  Apply
                </button>
              </form>
            ) : (
              `−${formatCents(money.discountCents)}`
            )}
          </dd>
        </div>
        {discountError && (
          <p id="discount-error" className="text-right text-base text-brick-700">
            {discountError}
          </p>
        )}
        <div className="flex items-center justify-between gap-3 border-t border-sand-300 pt-2 text-xl font-semibold">
          <dt>Total</dt>
          <dd className="num">{formatCents(money.totalCents)}</dd>
        </div>
      </dl>
      <ErrorNote error={patch.error} />
    </Panel>
  );
}

function Line({ label, cents }: { label: string; cents: number }) {
  return (
    <div className="flex items-center justify-between gap-3">
      <dt>{label}</dt>
      <dd className="num">{formatCents(cents)}</dd>
    </div>
  );
}

function BasisChoice(props: {
  checked: boolean;
  disabled: boolean;
  onChange: () => void;
  title: string;
  hint: string;
}) {
  return (
    <label className="flex min-h-12 cursor-pointer items-center gap-3 rounded-md border border-sand-300 px-3 py-2 has-checked:border-sea-700 has-checked:bg-sea-50">
      <input
        type="radio"
        name="labour-basis"
        checked={props.checked}
        disabled={props.disabled}
        onChange={props.onChange}
        className="size-5 shrink-0 accent-sea-700"
      />
      <span>
        <span className="block font-semibold">{props.title}</span>
        <span className="block text-sm text-slate-700">{props.hint}</span>
      </span>
    </label>
  );
}
