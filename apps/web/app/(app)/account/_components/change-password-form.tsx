'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { fieldErrors, FormAlert, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';

export function ChangePasswordForm() {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setErrors({});
    setAlert(null);
    try {
      await fetchJson('/api/me/password', {
        method: 'PUT',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({
          currentPassword: form.get('currentPassword'),
          newPassword: form.get('newPassword'),
        }),
      });
      setDone(true);
    } catch (e) {
      if (e instanceof ProblemError) {
        const found = fieldErrors(e.problem.errors);
        setErrors(found);
        if (Object.keys(found).length === 0) setAlert(e.message);
      } else setAlert('The password could not be changed. Try again.');
    } finally {
      setPending(false);
    }
  }

  if (done)
    return (
      <div role="status" className="space-y-3">
        <p className="font-medium text-slate-900">
          Password changed. You are signed out everywhere.
        </p>
        <Link href="/sign-in" className="font-medium text-sea-700 underline underline-offset-2">
          Sign in with the new password
        </Link>
      </div>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="max-w-md space-y-4">
      <FormAlert>{alert}</FormAlert>
      <TextField
        id="currentPassword"
        label="Current password"
        type="password"
        autoComplete="current-password"
        required
        error={errors.currentPassword}
      />
      <TextField
        id="newPassword"
        label="New password"
        type="password"
        autoComplete="new-password"
        required
        error={errors.newPassword}
      />
      <button
        type="submit"
        disabled={pending}
        className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-60"
      >
        {pending ? 'Saving…' : 'Change the password'}
      </button>
    </form>
  );
}
