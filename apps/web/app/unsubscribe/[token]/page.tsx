import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { Logo } from '~/components/logo';
import { unsubscribe, unsubscribeStatus } from '~/server/reminders/unsubscribe';

export const metadata: Metadata = {
  title: 'Service reminders',
  robots: { index: false, follow: false },
};
export const dynamic = 'force-dynamic';

/**
 * The link in every service reminder, no sign-in needed. Opening it only asks; the opt-out is
 * recorded by the button (a POST), so link scanners and prefetching cannot unsubscribe anyone.
 */
export default async function UnsubscribePage(props: {
  params: Promise<{ token: string }>;
  searchParams: Promise<{ done?: string }>;
}) {
  const { token } = await props.params;
  const { done } = await props.searchParams;
  const status = await unsubscribeStatus(token);

  async function stopReminders() {
    'use server';
    await unsubscribe(token);
    redirect(`/unsubscribe/${encodeURIComponent(token)}?done=1`);
  }

  return (
    <main className="mx-auto max-w-xl px-6 py-20">
      <div className="mb-10 flex items-center gap-3">
        <Logo className="size-10" />
        <span className="text-xl font-semibold text-sea-800">Reelwright</span>
      </div>
      {!status ? (
        <>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">
            This link does not work
          </h1>
          <p className="mt-4 text-lg text-slate-700">
            It may have been copied only in part. To stop service reminders, use the link at the
            bottom of the latest reminder, or ask the shop.
          </p>
        </>
      ) : status.subscribed ? (
        <>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">
            Stop service reminders from {status.shopName}?
          </h1>
          <p className="mt-4 text-lg text-slate-700">
            {status.shopName} will no longer e-mail you when your reels are due for a service.
            Messages about reels you leave with the shop, such as “ready for pickup”, still reach
            you.
          </p>
          <form action={stopReminders} className="mt-8">
            <button
              type="submit"
              className="min-h-11 rounded-md bg-sea-700 px-5 font-medium text-white hover:bg-sea-800"
            >
              Stop service reminders
            </button>
          </form>
        </>
      ) : (
        <>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">
            You will get no more service reminders
          </h1>
          <p className="mt-4 text-lg text-slate-700">
            {done
              ? `${status.shopName} will not e-mail you about servicing your reels again.`
              : `This was already recorded: ${status.shopName} does not e-mail you service reminders.`}{' '}
            Messages about reels you leave with the shop, such as “ready for pickup”, still reach
            you.
          </p>
          <p className="mt-4 text-slate-700">
            Changed your mind? Ask the shop on your next visit to turn reminders back on.
          </p>
        </>
      )}
    </main>
  );
}
