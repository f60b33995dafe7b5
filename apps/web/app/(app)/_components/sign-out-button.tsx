'use client';

import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => void signOut({ callbackUrl: '/sign-in' })}
      className="min-h-11 rounded-md border border-sea-500 px-3 font-medium text-white hover:bg-sea-700"
    >
      Sign out
    </button>
  );
}
