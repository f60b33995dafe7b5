'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, SelectField, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';
import { basisPointsFromText, centsFromText } from '~/lib/money-input';
import { parseDayHours, WEEKDAY_LABELS, WEEKDAYS, type ShopCreate } from '~/lib/validators/shops';

/** The owner opens a shop: where it is, when it is open, what it charges and owes. */
export function OpenShopForm({ regions }: { regions: { id: number; name: string }[] }) {
  const router = useRouter();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState('');
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    const get = (k: string) => String(form.get(k) ?? '').trim();
    const found: Record<string, string> = {};
    const weekly = {} as ShopCreate['weekly'];
    for (const d of WEEKDAYS) {
      const parsed = parseDayHours(get(`shop-${d}`));
      if ('error' in parsed) found[d] = parsed.error;
      else weekly[d] = parsed.spans;
    }
    const labour = centsFromText(get('shop-labour'));
    if (labour === null) found.labourRateCents = 'Give an amount such as 68.00';
    const royalty = basisPointsFromText(get('shop-royalty'));
    if (royalty === null) found.royaltyRateBp = 'Give a percentage such as 6 or 6.5';
    setErrors(found);
    setAlert(null);
    setDone('');
    if (Object.keys(found).length > 0) return;
    setPending(true);
    try {
      const shop = await fetchJson<{ name: string }>('/api/shops', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({
          name: get('shop-name'),
          regionId: Number(get('shop-region')) || 0,
          timeZone: get('shop-zone'),
          weekly,
          closedDates: get('shop-closed')
            .split(/[\s,]+/)
            .filter(Boolean),
          labourRateCents: labour,
          royaltyRateBp: royalty,
          currency: get('shop-currency').toUpperCase(),
        }),
      });
      formElement.reset();
      setDone(`${shop.name} is open.`);
      router.refresh();
    } catch (error) {
      if (error instanceof ProblemError) {
        const f = fieldErrors(error.problem.errors);
        const mapped: Record<string, string> = {};
        for (const [k, v] of Object.entries(f))
          mapped[
            k
              .replace(/^weekly\.(\w+)\..*$/, '$1')
              .replace(/^weekly\./, '')
              .replace(/^closedDates\.\d+$/, 'closedDates')
          ] ??= v;
        setErrors(mapped);
        if (Object.keys(mapped).length === 0) setAlert(error.message);
      } else setAlert('The shop could not be opened. Try again.');
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <TextField id="shop-name" label="Name" required error={errors.name} autoComplete="off" />
      <SelectField id="shop-region" label="Region" defaultValue="" error={errors.regionId}>
        <option value="">Choose a region</option>
        {regions.map((r) => (
          <option key={r.id} value={r.id}>
            {r.name}
          </option>
        ))}
      </SelectField>
      <TextField
        id="shop-zone"
        label="Time zone"
        hint="As the IANA database names it, e.g. America/Denver"
        required
        error={errors.timeZone}
        autoComplete="off"
      />
      <TextField
        id="shop-currency"
        label="Currency"
        defaultValue="USD"
        maxLength={3}
        required
        error={errors.currency}
      />
      <TextField
        id="shop-labour"
        label="Posted labour rate per hour"
        hint="In the shop's currency, e.g. 68.00"
        inputMode="decimal"
        required
        error={errors.labourRateCents}
      />
      <TextField
        id="shop-royalty"
        label="Royalty rate (%)"
        hint="Of billed revenue, e.g. 6"
        inputMode="decimal"
        required
        error={errors.royaltyRateBp}
      />
      <fieldset className="sm:col-span-2">
        <legend className="font-medium text-slate-800">Weekly opening hours</legend>
        <p className="text-sm text-slate-600">
          Spans such as 09:00–17:30, several separated by commas; leave a day empty when closed.
        </p>
        <div className="mt-2 grid gap-3 sm:grid-cols-2">
          {WEEKDAYS.map((d) => (
            <TextField key={d} id={`shop-${d}`} label={WEEKDAY_LABELS[d]} error={errors[d]} />
          ))}
        </div>
      </fieldset>
      <div className="sm:col-span-2">
        <label htmlFor="shop-closed" className="block font-medium text-slate-800">
          Closed dates
        </label>
        <p id="shop-closed-hint" className="text-sm text-slate-600">
          One date a line, as YYYY-MM-DD.
        </p>
        <textarea
          id="shop-closed"
          name="shop-closed"
          rows={3}
          aria-describedby={
            errors.closedDates ? 'shop-closed-hint shop-closed-error' : 'shop-closed-hint'
          }
          aria-invalid={errors.closedDates ? true : undefined}
          className="mt-1 block w-full rounded-md border border-slate-400 bg-white px-3 py-2 aria-invalid:border-brick-600"
        />
        {errors.closedDates && (
          <p id="shop-closed-error" className="mt-1 text-sm text-brick-700">
            {errors.closedDates}
          </p>
        )}
      </div>
      <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
        <button
          type="submit"
          disabled={pending}
          className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
        >
          {pending ? 'Opening…' : 'Open the shop'}
        </button>
        <p aria-live="polite" className="font-medium text-sea-800">
          {done}
        </p>
      </div>
    </form>
  );
}
