'use client';

import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, SelectField, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';
import { ROLE_LABELS, ROLES, type Role } from '~/lib/permissions';
import type { Choice } from '../../_components/invite-form';

interface PersonView {
  id: number;
  name: string;
  role: Role;
  shopId: number | null;
  regionId: number | null;
  status: 'active' | 'invited' | 'deactivated';
  invitationPending: boolean;
}

/** The owner's changes to one person: details, then the account's state, each its own request. */
export function PersonForm({
  person,
  shops,
  regions,
}: {
  person: PersonView;
  shops: Choice[];
  regions: Choice[];
}) {
  const router = useRouter();
  const [role, setRole] = useState<Role>(person.role);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState('');
  const [pending, setPending] = useState(false);
  const atShop = role === 'shop_lead' || role === 'technician';
  const inRegion = role === 'regional_manager';

  async function send(url: string, method: string, body: unknown, message: string) {
    setPending(true);
    setErrors({});
    setAlert(null);
    setDone('');
    try {
      await fetchJson(url, {
        method,
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
    const id = (key: string) => (form.get(key) ? Number(form.get(key)) : null);
    void send(
      `/api/users/${person.id}`,
      'PATCH',
      {
        name: form.get('person-name'),
        role,
        shopId: atShop ? id('person-shop') : null,
        regionId: inRegion ? id('person-region') : null,
      },
      'Saved.',
    );
  }

  const button =
    'inline-flex min-h-11 items-center rounded-md border border-sea-700 px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:opacity-60';
  return (
    <div className="space-y-6">
      <FormAlert>{alert}</FormAlert>
      <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2">
        <TextField
          id="person-name"
          label="Name"
          defaultValue={person.name}
          required
          error={errors.name}
        />
        <SelectField
          id="person-role"
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
          <SelectField
            id="person-shop"
            label="Shop"
            defaultValue={person.shopId ?? ''}
            error={errors.shopId}
          >
            <option value="">Choose a shop</option>
            {shops.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </SelectField>
        )}
        {inRegion && (
          <SelectField
            id="person-region"
            label="Region"
            defaultValue={person.regionId ?? ''}
            error={errors.regionId}
          >
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
            {pending ? 'Saving…' : 'Save the changes'}
          </button>
          <p aria-live="polite" className="font-medium text-sea-800">
            {done}
          </p>
        </div>
      </form>
      <div className="flex flex-wrap gap-3 border-t border-sand-200 pt-5">
        {person.status === 'deactivated' ? (
          <button
            type="button"
            disabled={pending}
            className={button}
            onClick={() =>
              void send(`/api/users/${person.id}`, 'PATCH', { active: true }, 'Reactivated.')
            }
          >
            Reactivate {person.name}
          </button>
        ) : (
          <button
            type="button"
            disabled={pending}
            className={button}
            onClick={() =>
              void send(
                `/api/users/${person.id}`,
                'PATCH',
                { active: false },
                'Deactivated: they are signed out and can no longer sign in.',
              )
            }
          >
            Deactivate {person.name}
          </button>
        )}
        {person.status === 'invited' && (
          <button
            type="button"
            disabled={pending}
            className={button}
            onClick={() =>
              void send(
                `/api/users/${person.id}/invite`,
                'POST',
                { action: 'resend' },
                'A fresh invitation is on its way; the earlier link no longer works.',
              )
            }
          >
            Send the invitation again
          </button>
        )}
        {person.status === 'invited' && person.invitationPending && (
          <button
            type="button"
            disabled={pending}
            className={button}
            onClick={() =>
              void send(
                `/api/users/${person.id}/invite`,
                'POST',
                { action: 'withdraw' },
                'Invitation withdrawn: its link no longer works.',
              )
            }
          >
            Withdraw the invitation
          </button>
        )}
      </div>
    </div>
  );
}
