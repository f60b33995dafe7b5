import Link from 'next/link';
import type { ReactNode } from 'react';
import { Logo } from '~/components/logo';
import { env } from '~/env';
import { navFor } from '~/lib/navigation';
import { ROLE_LABELS } from '~/lib/permissions';
import { requirePagePrincipal } from '~/server/session';
import { NavLinks } from './_components/nav-links';
import { SignOutButton } from './_components/sign-out-button';

export default async function AppLayout({ children }: { children: ReactNode }) {
  const principal = await requirePagePrincipal();
  const items = navFor(principal.role, principal.shopId, {
    mailCatcher: Boolean(env.MAIL_CATCHER_URL),
  }).map(({ href, label }) => ({ href, label }));
  return (
    <div className="min-h-screen">
      <a
        href="#main"
        className="sr-only z-50 rounded bg-white px-4 py-2 text-sea-800 focus:not-sr-only focus:absolute focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <header className="border-b border-sea-900 bg-sea-800 text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3 sm:px-6">
          <Link href="/" className="flex items-center gap-2.5 rounded">
            <Logo className="size-9" />
            <span className="text-xl font-semibold tracking-tight">Reelwright</span>
          </Link>
          <nav
            aria-label="Sections"
            className="order-last w-full sm:order-none sm:w-auto sm:flex-1"
          >
            <NavLinks items={items} />
          </nav>
          <div className="ml-auto flex items-center gap-4">
            <p className="text-right leading-tight">
              <span className="block font-medium">{principal.name}</span>
              <span className="block text-sm text-sea-100">{ROLE_LABELS[principal.role]}</span>
            </p>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 py-8 sm:px-6">
        {children}
      </main>
    </div>
  );
}
