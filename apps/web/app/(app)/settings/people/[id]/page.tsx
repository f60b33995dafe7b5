import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { Empty, NotAllowed, PageHeader, Panel } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { can, ROLE_LABELS } from '~/lib/permissions';
import { actionLabel, describeChange, STATUS_LABELS } from '~/lib/people-labels';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { getPerson } from '~/server/people';
import { listShops } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { listRegions } from '~/server/shops';
import { PersonForm } from './_components/person-form';

export const metadata: Metadata = { title: 'Person' };
export const dynamic = 'force-dynamic';

const utc = (d: Date) => formatInZone(d, 'UTC', 'd MMM yyyy, HH:mm');

export default async function PersonPage(props: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'people:read')) return <NotAllowed />;
  const id = idParam.safeParse((await props.params).id);
  if (!id.success) notFound();
  const person = await getPerson(principal, id.data).catch((error: unknown) => {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  });
  const manages = can(principal.role, 'users:manage');
  const [shops, regions] = await Promise.all([
    manages ? listShops(principal) : Promise.resolve([]),
    manages ? listRegions() : Promise.resolve([]),
  ]);
  const names = {
    shops: new Map(shops.map((s) => [s.id, s.name])),
    regions: new Map(regions.map((r) => [r.id, r.name])),
    roles: ROLE_LABELS as Record<string, string>,
  };
  if (person.shopId && person.shopName) names.shops.set(person.shopId, person.shopName);
  if (person.regionId && person.regionName) names.regions.set(person.regionId, person.regionName);
  const invitation = person.invitation;
  return (
    <>
      <p className="mb-2">
        <Link href="/settings/people" className="text-sea-700 underline underline-offset-2">
          ← People
        </Link>
      </p>
      <PageHeader
        title={person.name}
        lead={`${ROLE_LABELS[person.role]} · ${person.shopName ?? person.regionName ?? 'Whole network'} · ${STATUS_LABELS[person.status]}`}
      />
      <div className="space-y-8">
        <Panel title="Account">
          <dl className="grid gap-x-8 gap-y-2 sm:grid-cols-[max-content_1fr]">
            <dt className="font-medium text-slate-600">E-mail</dt>
            <dd>{person.email}</dd>
            <dt className="font-medium text-slate-600">Last signed in</dt>
            <dd>{person.lastSignInAt ? `${utc(person.lastSignInAt)} UTC` : 'Never'}</dd>
            {invitation && (
              <>
                <dt className="font-medium text-slate-600">Invitation</dt>
                <dd>
                  {invitation.state === 'pending'
                    ? `Sent ${utc(invitation.sentAt)} UTC; the link works until ${utc(invitation.expiresAt)} UTC.`
                    : invitation.state === 'expired'
                      ? `The link sent ${utc(invitation.sentAt)} UTC has expired.`
                      : `The link sent ${utc(invitation.sentAt)} UTC was withdrawn.`}
                </dd>
              </>
            )}
          </dl>
        </Panel>
        {manages && (
          <Panel
            title="Change"
            description="A new role, shop or region, or a deactivation, ends the person’s sessions: their next request asks them to sign in."
          >
            <PersonForm
              person={{
                id: person.id,
                name: person.name,
                role: person.role,
                shopId: person.shopId,
                regionId: person.regionId,
                status: person.status,
                invitationPending: invitation?.state === 'pending',
              }}
              shops={shops.filter((s) => s.active).map((s) => ({ id: s.id, name: s.name }))}
              regions={regions.map((r) => ({ id: r.id, name: r.name }))}
            />
          </Panel>
        )}
        <Panel title="History" description="Who changed what about this account (times in UTC).">
          {person.history.length === 0 ? (
            <Empty>No changes recorded.</Empty>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full min-w-[40rem] text-left">
                <caption className="sr-only">History of {person.name}</caption>
                <thead>
                  <tr className="border-b border-sand-300 text-sm text-slate-600">
                    <th scope="col" className="py-2 pr-4 font-medium">
                      When
                    </th>
                    <th scope="col" className="py-2 pr-4 font-medium">
                      What
                    </th>
                    <th scope="col" className="py-2 font-medium">
                      By
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {person.history.map((h, i) => (
                    <tr key={i} className="border-b border-sand-100 align-top">
                      <td className="py-2 pr-4 whitespace-nowrap">{utc(h.at)}</td>
                      <td className="py-2 pr-4">
                        {actionLabel(h.action)}
                        {describeChange(h.before, h.after, names).map((line) => (
                          <span key={line} className="block text-slate-700">
                            {line}
                          </span>
                        ))}
                      </td>
                      <td className="py-2">{h.by ?? 'The system'}</td>
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
