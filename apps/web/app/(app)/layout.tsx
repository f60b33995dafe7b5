import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from '~/components/logo';
import { env } from '~/env';
import { navFor } from '~/lib/navigation';
import { ROLE_LABELS } from '~/lib/permissions';
import * as clock from '~/server/clock';
import { requirePagePrincipal } from '~/server/session';
import { NavLinks } from './_components/nav-links';
import { ServerClock } from './_components/server-clock';
import { SignOutButton } from './_components/sign-out-button';

/**
 * The signed-in shell: a side rail of grouped sections on wide screens (1024 px and up), folding
 * into a bar with a "Sections" button on tablets in portrait and phones.
 */
export default async function AppLayout({ children }: { children: ReactNode }) {
  const principal = await requirePagePrincipal();
  const items = navFor(principal.role, principal.shopId, {
    mailCatcher: Boolean(env.MAIL_CATCHER_URL),
  }).map(({ href, label, group }) => ({ href, label, group }));
  return (
    <div className="min-h-screen lg:grid lg:grid-cols-[14rem_minmax(0,1fr)] print:block">
      <ServerClock now={clock.now().toISOString()} />
      <a
        href="#main"
        className="sr-only z-50 rounded bg-white px-4 py-2 text-sea-800 focus:not-sr-only focus:absolute focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header className="border-b border-sea-900 bg-sea-800 text-white lg:sticky lg:top-0 lg:flex lg:h-screen lg:flex-col lg:overflow-y-auto lg:border-r lg:border-b-0">
        <div className="flex flex-wrap items-center gap-x-4 gap-y-3 px-4 py-3 lg:flex-1 lg:flex-col lg:flex-nowrap lg:items-stretch lg:py-5">
          <Link href="/" className="flex items-center gap-2.5 rounded lg:mb-4 lg:px-1">
            <Logo className="size-9" />
            <span className="text-xl font-semibold tracking-tight">Reelwright</span>
          </Link>
          <div className="contents lg:block lg:flex-1">
            <NavLinks items={items} />
          </div>
          <div className="ml-auto flex items-center gap-3 lg:ml-0 lg:flex-col lg:items-stretch lg:border-t lg:border-sea-700 lg:pt-4">
            <p className="text-right leading-tight lg:px-1 lg:text-left">
              <span className="block font-medium">{principal.name}</span>
              <span className="block text-sm text-sea-100">{ROLE_LABELS[principal.role]}</span>
              <Link
                href="/account"
                className="inline-block text-sm text-white underline underline-offset-2 hover:text-sand-100"
              >
                Your account
              </Link>
            </p>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl min-w-0 px-4 py-8 sm:px-6">
        {children}
      </main>
    </div>
  );
}
