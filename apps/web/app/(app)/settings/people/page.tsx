import type { Metadata } from 'next';
import Link from 'next/link';
import { Empty, NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can, ROLE_LABELS } from '~/lib/permissions';
import { STATUS_LABELS } from '~/lib/people-labels';
import { listPeople } from '~/server/people';
import { listShops } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { listRegions } from '~/server/shops';
import { InviteForm } from './_components/invite-form';

export const metadata: Metadata = { title: 'People' };
export const dynamic = 'force-dynamic';

export default async function PeoplePage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'people:read')) return <NotAllowed />;
  const manages = can(principal.role, 'users:manage');
  const [people, shops, regions] = await Promise.all([
    listPeople(principal),
    manages ? listShops(principal) : Promise.resolve([]),
    manages ? listRegions() : Promise.resolve([]),
  ]);
  return (
    <>
      {can(principal.role, 'settings:manage') && (
        <p className="mb-2">
          <Link href="/settings" className="text-sea-700 underline underline-offset-2">
            ← Settings
          </Link>
        </p>
      )}
      <PageHeader
        title="People"
        lead={
          manages
            ? 'Everyone with an account. A change of role, shop or region, or a deactivation, signs the person out at once.'
            : 'The people of your region’s shops. Only the owner changes them.'
        }
      />
      <div className="space-y-8">
        {manages && (
          <Panel
            title="Invite someone"
            description="They get an e-mail with a link to choose their password; it works once, for 7 days."
          >
            <InviteForm
              shops={shops.filter((s) => s.active).map((s) => ({ id: s.id, name: s.name }))}
              regions={regions.map((r) => ({ id: r.id, name: r.name }))}
            />
          </Panel>
        )}
        <Panel title="Accounts" description={`${people.length} people.`}>
          {people.length === 0 ? (
            <Empty>Nobody yet.</Empty>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full min-w-[44rem] text-left">
                <caption className="sr-only">People</caption>
                <thead>
                  <tr className="border-b border-sand-300 text-sm text-slate-600">
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Name
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      E-mail
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Role
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      Works at
                    </th>
                    <th scope="col" className="py-2 font-medium">
                      Status
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {people.map((p) => (
                    <tr key={p.id} className="border-b border-sand-100">
                      <th scope="row" className="py-2 pr-4 font-medium">
                        <Link
                          href={`/settings/people/${p.id}`}
                          className="inline-flex min-h-11 items-center text-sea-700 underline underline-offset-2 hover:text-sea-900"
                        >
                          {p.name}
                        </Link>
                      </th>
                      <td className="py-2 pr-4">{p.email}</td>
                      <td className="py-2 pr-4">{ROLE_LABELS[p.role]}</td>
                      <td className="py-2 pr-4">{p.shopName ?? p.regionName ?? 'Whole network'}</td>
                      <td className="py-2">{STATUS_LABELS[p.status]}</td>
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
