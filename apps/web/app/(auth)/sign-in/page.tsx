import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { Logo } from '~/components/logo';
import { signInErrorMessage } from '~/lib/sign-in-errors';
import { getPrincipal } from '~/server/session';
import { SignInForm } from './_components/sign-in-form';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  if (await getPrincipal()) redirect('/');
  // next-auth sends a refused sign-in here with ?error= when it is not handled in the form.
  const { error } = await searchParams;
  const initialError = signInErrorMessage(typeof error === 'string' ? error : null);
  return (
    <main className="grid min-h-screen lg:grid-cols-[minmax(0,5fr)_minmax(0,4fr)]">
      <section className="relative hidden flex-col justify-between overflow-hidden bg-sea-800 p-12 text-sand-100 lg:flex">
        <div className="relative z-10 flex items-center gap-3">
          <Logo className="size-11" />
          <span className="text-2xl font-semibold tracking-tight text-white">Reelwright</span>
        </div>
        <div className="relative z-10 max-w-md">
          <p className="text-4xl leading-tight font-semibold text-white">
            One standard at every bench.
          </p>
          <p className="mt-4 text-lg text-sand-200">
            Check-ins, bench time, comebacks, audits and the month&rsquo;s figures for every shop in
            the network, in one place.
          </p>
        </div>
        <p className="relative z-10 text-sm text-sand-300">
          Saltwick &amp; Spool Reel Care · franchise network
        </p>
        {/* Line paid out across the panel in long casts, each leaving the last along its tangent. */}
        <svg
          aria-hidden="true"
          className="pointer-events-none absolute right-0 bottom-16 h-72 w-full text-sea-700"
          viewBox="0 0 400 200"
          preserveAspectRatio="none"
        >
          <path
            d="M0 190C90 180 160 140 220 90S330 24 400 20"
            fill="none"
            stroke="currentColor"
            vectorEffect="non-scaling-stroke"
            strokeWidth="6"
            strokeLinecap="round"
          />
          <path
            d="M60 200C150 186 210 160 270 120S350 66 400 60"
            fill="none"
            stroke="currentColor"
            vectorEffect="non-scaling-stroke"
            strokeWidth="3"
            strokeLinecap="round"
          />
          <path
            d="M150 200C220 192 280 176 330 150S380 120 400 116"
            fill="none"
            stroke="currentColor"
            vectorEffect="non-scaling-stroke"
            strokeWidth="2"
            strokeLinecap="round"
          />
        </svg>
      </section>
      <section className="flex items-center justify-center p-6 sm:p-12">
        <div className="w-full max-w-sm">
          <div className="mb-8 flex items-center gap-3 lg:hidden">
            <Logo />
            <span className="text-xl font-semibold text-sea-800">Reelwright</span>
          </div>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">Sign in</h1>
          <p className="mt-2 text-slate-600">
            Use the e-mail address your shop or the network gave you.
          </p>
          <SignInForm initialError={initialError} />
        </div>
      </section>
    </main>
  );
}
