'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, SelectField, TextField } from '~/components/fields';
import { Panel } from '~/components/ui';
import { fetchJson, ProblemError } from '~/lib/api-client';
import { basisPointsFromText, centsFromText, centsText, percentText } from '~/lib/money-input';

interface ShopDetails {
  id: number;
  name: string;
  regionId: number;
  labourRateCents: number;
  royaltyRateBp: number;
  currency: string;
  active: boolean;
}

/** Rename, move to another region, change the rates; close or reopen the shop. */
export function ShopDetailsForm({
  shop,
  regions,
  rates,
}: {
  shop: ShopDetails;
  regions: { id: number; name: string }[];
  /** Dated royalty rates, oldest first; empty while the rate has never changed. */
  rates: { fromMonth: string; royaltyRateBp: number }[];
}) {
  const router = useRouter();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState('');
  const [pending, setPending] = useState(false);

  async function patch(body: Record<string, unknown>, message: string) {
    setPending(true);
    setAlert(null);
    setDone('');
    try {
      await fetchJson(`/api/shops/${shop.id}`, {
        method: 'PATCH',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify(body),
      });
      setDone(message);
      router.refresh();
    } catch (error) {
      if (error instanceof ProblemError) {
        const found = fieldErrors(error.problem.errors);
        setErrors(found);
        if (Object.keys(found).length === 0) setAlert(error.message);
      } else setAlert('The change could not be saved. Try again.');
    } finally {
      setPending(false);
    }
  }

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const get = (k: string) => String(form.get(k) ?? '').trim();
    const labour = centsFromText(get('details-labour'));
    const royalty = basisPointsFromText(get('details-royalty'));
    const from = get('details-royalty-from');
    const found: Record<string, string> = {};
    if (labour === null) found.labourRateCents = 'Give an amount such as 68.00';
    if (royalty === null) found.royaltyRateBp = 'Give a percentage such as 6 or 6.5';
    if (from && !/^\d{4}-\d{2}$/.test(from)) found.royaltyFrom = 'Give a month such as 2027-01';
    setErrors(found);
    if (Object.keys(found).length > 0) return;
    void patch(
      {
        name: get('details-name'),
        regionId: Number(get('details-region')),
        labourRateCents: labour,
        // The royalty is sent only when it changes: a new rate is dated from a month on.
        ...((royalty !== shop.royaltyRateBp || from) && {
          royaltyRateBp: royalty,
          ...(from && { royaltyFrom: from }),
        }),
      },
      'Saved.',
    );
  }

  return (
    <Panel
      title="Shop details"
      description="A new royalty rate starts in the month you give (this month when left empty) and never in a closed month; a new labour rate applies to work billed from now on."
    >
      <div className="space-y-5">
        <FormAlert>{alert}</FormAlert>
        <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
          <TextField
            id="details-name"
            label="Name"
            defaultValue={shop.name}
            required
            error={errors.name}
          />
          <SelectField
            id="details-region"
            label="Region"
            defaultValue={shop.regionId}
            error={errors.regionId}
          >
            {regions.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </SelectField>
          <TextField
            id="details-labour"
            label={`Posted labour rate per hour (${shop.currency})`}
            defaultValue={centsText(shop.labourRateCents)}
            inputMode="decimal"
            error={errors.labourRateCents}
          />
          <TextField
            id="details-royalty"
            label="Royalty rate (%)"
            defaultValue={percentText(shop.royaltyRateBp)}
            inputMode="decimal"
            error={errors.royaltyRateBp}
          />
          <TextField
            id="details-royalty-from"
            label="New royalty rate from (month)"
            hint="YYYY-MM; empty for this month"
            placeholder="2027-01"
            error={errors.royaltyFrom}
          />
          <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
            <button
              type="submit"
              disabled={pending}
              className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
            >
              Save the details
            </button>
            <button
              type="button"
              disabled={pending}
              onClick={() =>
                void patch(
                  { active: !shop.active },
                  shop.active
                    ? `${shop.name} is closed: it takes no new jobs.`
                    : `${shop.name} is open again.`,
                )
              }
              className="inline-flex min-h-12 items-center rounded-md border border-brick-600 px-4 font-medium text-brick-800 hover:bg-brick-50 disabled:opacity-60"
            >
              {shop.active ? `Close ${shop.name}` : `Reopen ${shop.name}`}
            </button>
            <p aria-live="polite" className="font-medium text-sea-800">
              {done}
            </p>
          </div>
        </form>
        {rates.length > 0 && (
          <table className="w-full max-w-md text-left">
            <caption className="text-left font-medium text-slate-800">
              Royalty rates by month
            </caption>
            <thead>
              <tr className="border-b border-sand-300 text-sm text-slate-600">
                <th scope="col" className="py-2 pr-4 font-medium">
                  From
                </th>
                <th scope="col" className="py-2 text-right font-medium">
                  Rate
                </th>
              </tr>
            </thead>
            <tbody>
              {rates.map((r) => (
                <tr key={r.fromMonth} className="border-b border-sand-100">
                  <td className="py-2 pr-4">
                    {r.fromMonth === '2000-01' ? 'Earlier months' : r.fromMonth}
                  </td>
                  <td className="py-2 text-right tabular-nums">{percentText(r.royaltyRateBp)}%</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
    </Panel>
  );
}
