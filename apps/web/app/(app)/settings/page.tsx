import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { can } from '~/lib/permissions';
import { mailAndReminders } from '~/server/queries/mail';
import { listShops } from '~/server/queries/shops';
import { listPeople } from '~/server/people';
import { requirePagePrincipal } from '~/server/session';
import { recentSignInBlocks } from '~/server/sign-in-throttle';
import { UndeliveredMail, WeeklyRemindersSwitch } from './_components/mail-and-reminders';

export const metadata: Metadata = { title: 'Settings' };
export const dynamic = 'force-dynamic';

export default async function SettingsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'settings:manage')) return <NotAllowed />;
  const [people, shops, blocks, mail] = await Promise.all([
    listPeople(principal),
    listShops(principal),
    recentSignInBlocks(),
    mailAndReminders(),
  ]);

  return (
    <>
      <PageHeader title="Settings" lead="The network's shops and the people who work in them." />
      <div className="space-y-8">
        <Panel title="Standards" description="What the network's work is measured against.">
          <Link
            href="/settings/audit-form"
            className="font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
          >
            Audit form
          </Link>
          <p className="text-slate-600">
            The items auditors score sampled jobs against, with weights and critical items.
          </p>
          <Link
            href="/settings/comebacks"
            className="mt-4 inline-block font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
          >
            Comebacks
          </Link>
          <p className="text-slate-600">
            The warranty window, the review deadline, which attributions count against a shop, and
            the root cause list.
          </p>
        </Panel>
        <Panel
          title="Shops"
          description="Each shop's region, time zone and opening hours; all times at a shop are shown in its zone, and turnaround counts the hours it is open."
        >
          <p className="mb-3">
            <Link
              href="/settings/shops"
              className="inline-flex min-h-11 items-center font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
            >
              Shops and regions
            </Link>
            <span className="block text-slate-600">
              Open a shop, rename, move or close one, and manage the regions.
            </span>
          </p>
          <div className="overflow-x-auto">
            <table className="w-full min-w-[36rem] text-left">
              <caption className="sr-only">Shops</caption>
              <thead>
                <tr className="border-b border-sand-300 text-sm text-slate-600">
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Shop
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Region
                  </th>
                  <th scope="col" className="py-2 pr-4 font-medium">
                    Time zone
                  </th>
                  <th scope="col" className="py-2 font-medium">
                    Opening hours
                  </th>
                </tr>
              </thead>
              <tbody>
                {shops.map((s) => (
                  <tr key={s.id} className="border-b border-sand-100">
                    <th scope="row" className="py-3 pr-4 font-medium">
                      {s.name}
                    </th>
                    <td className="py-3 pr-4">{s.region.name}</td>
                    <td className="py-3 pr-4">{s.timeZone}</td>
                    <td className="py-3">
                      <Link
                        href={`/settings/shops/${s.id}`}
                        className="inline-flex min-h-11 items-center font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
                      >
                        Hours and closed dates
                        <span className="sr-only"> of {s.name}</span>
                      </Link>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Panel>
        <Panel
          title="People"
          description={`${people.filter((p) => p.status === 'active').length} active accounts, ${people.filter((p) => p.status === 'invited').length} invited, ${people.filter((p) => p.status === 'deactivated').length} deactivated.`}
        >
          <Link
            href="/settings/people"
            className="inline-flex min-h-11 items-center font-medium text-sea-700 underline underline-offset-2 hover:text-sea-900"
          >
            People
          </Link>
          <p className="text-slate-600">
            Invite people, change their role or shop, and deactivate those who have left.
          </p>
        </Panel>
        <Panel
          title="Mail and reminders"
          description="E-mail goes out from a queue and is retried with growing waits; a message that still fails after every retry is listed here with its last error until it is resent."
        >
          <WeeklyRemindersSwitch initial={mail.weeklyReminders} />
          <h3 className="mt-6 font-semibold text-slate-900">Undelivered mail</h3>
          <UndeliveredMail
            rows={mail.undelivered.map((m) => ({
              id: m.id,
              to: m.to,
              subject: m.subject,
              attempts: m.attempts,
              lastError: m.lastError,
              queued: formatInZone(m.createdAt, 'UTC', 'd MMM yyyy, HH:mm'),
            }))}
          />
        </Panel>
        <Panel
          title="Sign-in blocks"
          description="The latest accounts and addresses blocked after repeated failed sign-ins (times in UTC)."
        >
          {blocks.length === 0 ? (
            <p className="text-slate-600">No sign-in has been blocked.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full min-w-[40rem] text-left">
                <caption className="sr-only">Sign-in blocks</caption>
                <thead>
                  <tr className="border-b border-sand-300 text-sm text-slate-600">
                    <th scope="col" className="py-2 pr-4 font-medium">
                      When
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Blocked
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      E-mail tried
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Address
                    </th>
                    <th scope="col" className="py-2 font-medium">
                      For
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {blocks.map((b, i) => (
                    <tr key={i} className="border-b border-sand-100">
                      <td className="py-3 pr-4">
                        {formatInZone(b.at, 'UTC', 'd MMM yyyy, HH:mm')}
                      </td>
                      <td className="py-3 pr-4">
                        {b.blocked === 'account' ? 'Account' : 'Address'}
                      </td>
                      <td className="py-3 pr-4">{b.email ?? '–'}</td>
                      <td className="py-3 pr-4">{b.address}</td>
                      <td className="py-3">{Math.round(b.seconds / 60)} min</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Panel>
      </div>
    </>
  );
}
