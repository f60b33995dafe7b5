'use client';

import Link from 'next/link';
import { useState, type FormEvent } from 'react';
import { FormAlert, TextField } from '~/components/fields';
import { fetchJson, ProblemError } from '~/lib/api-client';

/** Asks for a reset link; the answer reads the same whether or not the address has an account. */
export function ForgotPasswordForm() {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [error, setError] = useState<string | undefined>();
  const [alert, setAlert] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const email = String(new FormData(event.currentTarget).get('email') ?? '').trim();
    setPending(true);
    setError(undefined);
    setAlert(null);
    try {
      await fetchJson('/api/auth/password-reset', {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email }),
      });
      setSentTo(email);
    } catch (e) {
      if (e instanceof ProblemError && e.problem.errors?.length)
        setError(e.problem.errors[0]!.message);
      else setAlert('The request could not be sent. Try again.');
    } finally {
      setPending(false);
    }
  }

  if (sentTo)
    return (
      <div className="mt-8 space-y-4" role="status">
        <p className="text-lg font-medium text-slate-900">Check your e-mail</p>
        <p className="text-slate-700">
          If {sentTo} has a Reelwright account, a link to choose a new password is on its way. It
          works once, for an hour.
        </p>
        <p>
          <Link href="/sign-in" className="font-medium text-sea-700 underline underline-offset-2">
            Back to sign in
          </Link>
        </p>
      </div>
    );
  return (
    <form onSubmit={onSubmit} noValidate className="mt-8 space-y-5">
      <FormAlert>{alert}</FormAlert>
      <TextField
        id="email"
        label="E-mail"
        type="email"
        autoComplete="username"
        required
        error={error}
      />
      <button
        type="submit"
        disabled={pending}
        className="flex min-h-12 w-full items-center justify-center rounded-md bg-sea-700 px-4 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
      >
        {pending ? 'Sending…' : 'Send me a link'}
      </button>
      <p>
        <Link href="/sign-in" className="font-medium text-sea-700 underline underline-offset-2">
          Back to sign in
        </Link>
      </p>
    </form>
  );
}
