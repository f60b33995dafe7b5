'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { FormAlert, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';
import { MIN_PASSWORD_LENGTH } from '~/lib/validators/people';

export function SetPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  const [errors, setErrors] = useState<{ password?: string; repeat?: string }>({});
  const [alert, setAlert] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const password = String(form.get('new-password') ?? '');
    const repeat = String(form.get('repeat-password') ?? '');
    setAlert(null);
    if (password.length < MIN_PASSWORD_LENGTH) {
      setErrors({ password: `Use at least ${MIN_PASSWORD_LENGTH} characters` });
      return;
    }
    if (password !== repeat) {
      setErrors({ repeat: 'The two passwords differ' });
      return;
    }
    setErrors({});
    setPending(true);
    try {
      await fetchJson('/api/auth/password-reset/confirm', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ token, password }),
      });
      setDone(true);
    } catch (e) {
      if (e instanceof ProblemError) {
        const field = e.problem.errors?.find((x) => x.field === 'body.password');
        if (field) setErrors({ password: field.message });
        else
          setAlert(e.problem.detail ? `${e.problem.title ?? ''}. ${e.problem.detail}` : e.message);
      } else setAlert('The password could not be saved. Try again.');
    } finally {
      setPending(false);
    }
  }

  if (done)
    return (
      <div className="mt-8 space-y-4" role="status">
        <p className="text-lg font-medium text-slate-900">Your password is set.</p>
        <p>
          <Link
            href="/sign-in"
            className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-6 text-lg font-semibold text-white hover:bg-sea-800"
          >
            Sign in
          </Link>
        </p>
      </div>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="mt-8 space-y-5">
      <FormAlert>{alert}</FormAlert>
      <TextField
        id="new-password"
        label="New password"
        type="password"
        autoComplete="new-password"
        required
        error={errors.password}
      />
      <TextField
        id="repeat-password"
        label="The same password again"
        type="password"
        autoComplete="new-password"
        required
        error={errors.repeat}
      />
      <button
        type="submit"
        disabled={pending}
        className="flex min-h-12 w-full items-center justify-center rounded-md bg-sea-700 px-4 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
      >
        {pending ? 'Saving…' : 'Save the password'}
      </button>
    </form>
  );
}
