'use client';

import { useState } from 'react';

/**
 * Signs out through next-auth's own endpoints (a CSRF token, then the POST that ends the session
 * and clears the cookie) without next-auth's client library, which every page would carry.
 */
async function signOut() {
  const { csrfToken } = (await (await fetch('/api/auth/csrf')).json()) as { csrfToken: string };
  await fetch('/api/auth/signout', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ csrfToken, callbackUrl: '/sign-in', json: 'true' }),
  });
}

export function SignOutButton() {
  const [leaving, setLeaving] = useState(false);
  return (
    <button
      type="button"
      disabled={leaving}
      onClick={() => {
        setLeaving(true);
        // Whatever the answer, leave with a full load, so nothing of the session stays in memory;
        // the sign-in page shows whether the session is gone.
        void signOut()
          .catch(() => undefined)
          .finally(() => window.location.replace(new URL('/sign-in', window.location.origin)));
      }}
      className="min-h-11 rounded-md border border-sea-500 px-3 font-medium text-white hover:bg-sea-700 disabled:opacity-70"
    >
      {leaving ? 'Signing out…' : 'Sign out'}
    </button>
  );
}
