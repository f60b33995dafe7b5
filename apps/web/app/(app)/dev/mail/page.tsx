import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { Empty, NotAllowed, PageHeader, Panel, Stat } from '~/components/ui';
import { env } from '~/env';
import { formatCount, formatInZone } from '~/lib/format';
import { can } from '~/lib/permissions';
import { catcherConfigured, caughtMessages, outboxSummary } from '~/server/mail/catcher';
import { deliverPending } from '~/server/mail/outbox';
import { requirePagePrincipal } from '~/server/session';
import { RetryButton } from './_components/retry-button';

export const metadata: Metadata = { title: 'Caught e-mail' };
export const dynamic = 'force-dynamic';

export default async function DevMailPage({
  searchParams,
}: {
  searchParams: Promise<{ to?: string }>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'dev-mail:read')) return <NotAllowed />;
  // A tool for development and tests: in production it exists only where a catcher is configured.
  if (!catcherConfigured()) {
    if (env.NODE_ENV === 'production') notFound();
    return (
      <>
        <PageHeader title="Caught e-mail" />
        <Panel title="No mail catcher configured">
          <p className="text-slate-700">
            Start the local fakes (<code>node apps/web/scripts/fakes.mjs</code>) and set{' '}
            <code>SMTP_URL</code> and <code>MAIL_CATCHER_URL</code> to the addresses it prints;{' '}
            <code>npm run demo</code> does this for you.
          </p>
        </Panel>
      </>
    );
  }

  const to = (await searchParams).to?.trim() || undefined;
  // Each visit also sends what is due, so a message queued a moment ago shows up here.
  await deliverPending();
  const [messages, outbox] = await Promise.all([
    caughtMessages(to).catch(() => null),
    outboxSummary(),
  ]);

  return (
    <>
      <PageHeader
        title="Caught e-mail"
        lead="What Reelwright sent while running with the local SMTP catcher. Nothing here reached a real mailbox."
        actions={<RetryButton />}
      />
      <dl className="mb-8 grid grid-cols-1 gap-4 sm:grid-cols-3">
        <Stat label="Waiting to send" value={formatCount(outbox.pending)} />
        <Stat label="Sent" value={formatCount(outbox.sent)} />
        <Stat
          label="Failed, will retry"
          value={formatCount(outbox.failed)}
          hint={outbox.lastError ? `Last error: ${outbox.lastError}` : undefined}
        />
      </dl>

      <form className="mb-6 flex flex-wrap items-end gap-3" role="search">
        <div>
          <label htmlFor="to" className="block text-sm font-medium text-slate-700">
            Recipient
          </label>
          <input
            id="to"
            name="to"
            type="email"
            defaultValue={to}
            placeholder="customer@example.test"
            className="mt-1 min-h-11 w-96 max-w-full rounded-md border border-slate-400 bg-white px-3"
          />
        </div>
        <button
          type="submit"
          className="min-h-11 rounded-md border border-slate-400 bg-white px-4 font-medium text-slate-800 hover:bg-sand-100"
        >
          Show
        </button>
        {to && (
          <a href="/dev/mail" className="min-h-11 py-2.5 font-medium text-sea-800 underline">
            Show all
          </a>
        )}
      </form>

      {messages === null ? (
        <p role="alert" className="text-brick-800">
          The mail catcher at {env.MAIL_CATCHER_URL} did not answer. Is the fakes script running?
        </p>
      ) : messages.length === 0 ? (
        <Panel title="No messages">
          <Empty>
            {to ? `Nothing was sent to ${to}.` : 'Nothing has been sent since the catcher started.'}
          </Empty>
        </Panel>
      ) : (
        <ol className="space-y-4" aria-label="Caught messages, newest first">
          {messages.map((m) => (
            <li key={m.id}>
              <article
                aria-labelledby={`m-${m.id}`}
                className="rounded-lg border border-sand-200 bg-white shadow-sm"
              >
                <header className="border-b border-sand-200 px-5 py-3">
                  <h2 id={`m-${m.id}`} className="text-lg font-semibold text-slate-900">
                    {m.subject || '(no subject)'}
                  </h2>
                  <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm text-slate-700">
                    <dt className="font-medium">To</dt>
                    <dd>{m.envelope.to.join(', ') || m.to}</dd>
                    <dt className="font-medium">From</dt>
                    <dd>{m.from ?? m.envelope.from}</dd>
                    <dt className="font-medium">Received</dt>
                    <dd>
                      <time dateTime={m.receivedAt}>
                        {formatInZone(new Date(m.receivedAt), 'UTC', 'd MMM yyyy, HH:mm:ss')} UTC
                      </time>
                    </dd>
                  </dl>
                </header>
                <pre className="px-5 py-4 font-sans whitespace-pre-wrap text-slate-900">
                  {m.text}
                </pre>
                {m.html && (
                  <details className="border-t border-sand-200 px-5 py-3">
                    <summary className="cursor-pointer font-medium text-sea-800">
                      HTML version
                    </summary>
                    <iframe
                      sandbox=""
                      srcDoc={m.html}
                      title={`HTML version of “${m.subject}”`}
                      className="mt-3 h-64 w-full rounded border border-sand-200 bg-white"
                    />
                  </details>
                )}
              </article>
            </li>
          ))}
        </ol>
      )}
    </>
  );
}
