'use client';

import { signIn } from 'next-auth/react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useState, type FormEvent } from 'react';
import { signInErrorMessage, WRONG_CREDENTIALS } from '~/lib/sign-in-errors';

export function SignInForm({ initialError = null }: { initialError?: string | null }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(initialError);
  const [fieldErrors, setFieldErrors] = useState<Partial<Record<'email' | 'password', string>>>({});
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { signInSchema } = await import('~/lib/validators/auth');
    const parsed = signInSchema.safeParse({
      email: form.get('email'),
      password: form.get('password'),
    });
    if (!parsed.success) {
      const errors: Partial<Record<'email' | 'password', string>> = {};
      for (const issue of parsed.error.issues) {
        const key = issue.path[0];
        if ((key === 'email' || key === 'password') && !errors[key]) errors[key] = issue.message;
      }
      setFieldErrors(errors);
      setError(null);
      return;
    }
    setFieldErrors({});
    setPending(true);
    setError(null);
    const result = await signIn('credentials', { ...parsed.data, redirect: false });
    setPending(false);
    if (!result || result.error) {
      // One message for every failure, so the form never tells whether an address has an account;
      // a throttled attempt also says how long to wait.
      setError(signInErrorMessage(result?.error) ?? WRONG_CREDENTIALS);
      return;
    }
    router.replace('/');
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} noValidate className="mt-8 space-y-5">
      {error && (
        <p
          role="alert"
          className="rounded-md border border-brick-200 bg-brick-50 px-4 py-3 text-brick-800"
        >
          {error}
        </p>
      )}
      <Field
        name="email"
        label="E-mail"
        type="email"
        autoComplete="username"
        error={fieldErrors.email}
      />
      <Field
        name="password"
        label="Password"
        type="password"
        autoComplete="current-password"
        error={fieldErrors.password}
      />
      <button
        type="submit"
        disabled={pending}
        className="flex min-h-12 w-full items-center justify-center rounded-md bg-sea-700 px-4 text-lg font-semibold text-white hover:bg-sea-800 disabled:opacity-70"
      >
        {pending ? 'Signing in…' : 'Sign in'}
      </button>
      <p>
        <Link
          href="/forgot-password"
          className="inline-flex min-h-11 items-center font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
        >
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}

function Field(props: {
  name: 'email' | 'password';
  label: string;
  type: string;
  autoComplete: string;
  error?: string;
}) {
  const errorId = `${props.name}-error`;
  return (
    <div>
      <label htmlFor={props.name} className="block font-medium text-slate-800">
        {props.label}
      </label>
      <input
        id={props.name}
        name={props.name}
        type={props.type}
        autoComplete={props.autoComplete}
        required
        aria-invalid={props.error ? true : undefined}
        aria-describedby={props.error ? errorId : undefined}
        className="mt-1.5 block min-h-12 w-full rounded-md border border-slate-400 bg-white px-3 text-lg text-slate-900 aria-invalid:border-brick-600"
      />
      {props.error && (
        <p id={errorId} className="mt-1 text-sm text-brick-700">
          {props.error}
        </p>
      )}
    </div>
  );
}
