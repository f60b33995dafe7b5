'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';

export function RegionForm() {
  const router = useRouter();
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState('');
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const formElement = event.currentTarget;
    const form = new FormData(formElement);
    setPending(true);
    setErrors({});
    setAlert(null);
    setDone('');
    try {
      const region = await fetchJson<{ name: string }>('/api/regions', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ name: form.get('region-name'), code: form.get('region-code') }),
      });
      formElement.reset();
      setDone(`Region ${region.name} added.`);
      router.refresh();
    } catch (error) {
      if (error instanceof ProblemError) {
        const found = fieldErrors(error.problem.errors);
        setErrors(found);
        if (Object.keys(found).length === 0) setAlert(error.message);
      } else setAlert('The region could not be added. Try again.');
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <TextField id="region-name" label="Region name" required error={errors.name} />
      <TextField
        id="region-code"
        label="Short code"
        hint="Lower-case letters, digits and hyphens"
        required
        error={errors.code}
      />
      <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
        <button
          type="submit"
          disabled={pending}
          className="inline-flex min-h-11 items-center rounded-md border border-sea-700 px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:opacity-60"
        >
          Add the region
        </button>
        <p aria-live="polite" className="font-medium text-sea-800">
          {done}
        </p>
      </div>
    </form>
  );
}
