import type { Metadata } from 'next';
import { Logo } from '~/components/logo';
import { unsubscribe } from '~/server/reminders/unsubscribe';

export const metadata: Metadata = {
  title: 'Service reminders',
  robots: { index: false, follow: false },
};
export const dynamic = 'force-dynamic';

/** The link in every service reminder: records the opt-out at once, no sign-in needed. */
export default async function UnsubscribePage(props: { params: Promise<{ token: string }> }) {
  const { token } = await props.params;
  const result = await unsubscribe(token);
  return (
    <main className="mx-auto max-w-xl px-6 py-20">
      <div className="mb-10 flex items-center gap-3">
        <Logo className="size-10" />
        <span className="text-xl font-semibold text-sea-800">Reelwright</span>
      </div>
      {result ? (
        <>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">
            You will get no more service reminders
          </h1>
          <p className="mt-4 text-lg text-slate-700">
            {result.changed
              ? `${result.shopName} will not e-mail you about servicing your reels again.`
              : `This was already recorded: ${result.shopName} does not e-mail you service reminders.`}{' '}
            Messages about reels you leave with the shop, such as “ready for pickup”, still reach
            you.
          </p>
          <p className="mt-4 text-slate-700">
            Changed your mind? Ask the shop on your next visit to turn reminders back on.
          </p>
        </>
      ) : (
        <>
          <h1 className="text-3xl font-semibold tracking-tight text-slate-900">
            This link does not work
          </h1>
          <p className="mt-4 text-lg text-slate-700">
            It may have been copied only in part. To stop service reminders, use the link at the
            bottom of the latest reminder, or ask the shop.
          </p>
        </>
      )}
    </main>
  );
}
