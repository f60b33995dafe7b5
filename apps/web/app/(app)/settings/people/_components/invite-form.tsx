'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, SelectField, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';
import { ROLE_LABELS, ROLES, type Role } from '~/lib/permissions';

export interface Choice {
  id: number;
  name: string;
}

/** The owner's invitation: name, e-mail, role and where they work; the link goes by e-mail. */
export function InviteForm({ shops, regions }: { shops: Choice[]; regions: Choice[] }) {
  const router = useRouter();
  const [role, setRole] = useState<Role>('technician');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState('');
  const [pending, setPending] = useState(false);
  const atShop = role === 'shop_lead' || role === 'technician';
  const inRegion = role === 'regional_manager';

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const id = (key: string) => (form.get(key) ? Number(form.get(key)) : undefined);
    setPending(true);
    setErrors({});
    setAlert(null);
    setDone('');
    try {
      const person = await fetchJson<{ name: string; email: string }>('/api/users', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({
          name: form.get('invite-name'),
          email: form.get('invite-email'),
          role,
          ...(atShop && { shopId: id('invite-shop') }),
          ...(inRegion && { regionId: id('invite-region') }),
        }),
      });
      (event.target as HTMLFormElement).reset();
      setDone(`Invitation sent to ${person.name} at ${person.email}.`);
      router.refresh();
    } catch (error) {
      if (error instanceof ProblemError) {
        const found = fieldErrors(error.problem.errors);
        setErrors(found);
        if (Object.keys(found).length === 0) setAlert(error.message);
      } else setAlert('The invitation could not be sent. Try again.');
    } finally {
      setPending(false);
    }
  }

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <TextField id="invite-name" label="Name" autoComplete="off" required error={errors.name} />
      <TextField
        id="invite-email"
        label="E-mail"
        type="email"
        autoComplete="off"
        required
        error={errors.email}
      />
      <SelectField
        id="invite-role"
        label="Role"
        value={role}
        onChange={(e) => setRole(e.target.value as Role)}
        error={errors.role}
      >
        {ROLES.map((r) => (
          <option key={r} value={r}>
            {ROLE_LABELS[r]}
          </option>
        ))}
      </SelectField>
      {atShop && (
        <SelectField id="invite-shop" label="Shop" error={errors.shopId} defaultValue="">
          <option value="">Choose a shop</option>
          {shops.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </SelectField>
      )}
      {inRegion && (
        <SelectField id="invite-region" label="Region" error={errors.regionId} defaultValue="">
          <option value="">Choose a region</option>
          {regions.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
            </option>
          ))}
        </SelectField>
      )}
      <div className="flex flex-wrap items-center gap-4 sm:col-span-2">
        <button
          type="submit"
          disabled={pending}
          className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
        >
          {pending ? 'Sending…' : 'Send the invitation'}
        </button>
        <p aria-live="polite" className="font-medium text-sea-800">
          {done}
        </p>
      </div>
    </form>
  );
}
