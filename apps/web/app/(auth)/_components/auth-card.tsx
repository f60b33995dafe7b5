import type { ReactNode } from 'react';
import { Logo } from '~/components/logo';

/** The plain signed-out frame of the password pages: the mark, a heading and the form. */
export function AuthCard(props: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center bg-sand-50 p-6 sm:p-12">
      <div className="w-full max-w-md rounded-lg border border-sand-200 bg-white p-8 shadow-sm">
        <div className="mb-8 flex items-center gap-3">
          <Logo />
          <span className="text-xl font-semibold text-sea-800">Reelwright</span>
        </div>
        <h1 className="text-3xl font-semibold tracking-tight text-slate-900">{props.title}</h1>
        {props.lead && <p className="mt-2 text-slate-600">{props.lead}</p>}
        {props.children}
      </div>
    </main>
  );
}
