import type { Metadata } from 'next';
import { PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { benchListOptions, promiseSuggestion } from '~/server/queries/bench';
import { requirePagePrincipal } from '~/server/session';
import { CheckInForm } from './_components/check-in-form';

export const metadata: Metadata = { title: 'Check a reel in' };
export const dynamic = 'force-dynamic';

export default async function CheckInPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'jobs:write') || principal.scope.kind !== 'shop') {
    return (
      <div className="rounded-lg border border-sand-200 bg-white p-8">
        <h1 className="text-2xl font-semibold">Checking reels in is for the shop’s own people</h1>
        <p className="mt-2 text-slate-600">
          Technicians and shop leads check reels in at their bench. You can read every job on the
          Bench page.
        </p>
      </div>
    );
  }
  const shopId = principal.scope.shopId;
  const [suggestion, options] = await Promise.all([
    promiseSuggestion(principal, shopId),
    benchListOptions(principal),
  ]);
  const shop = options.shops.find((s) => s.id === shopId)!;
  return (
    <>
      <PageHeader
        title="Check a reel in"
        lead={`At ${shop.name}. Find the customer or add them, pick or add the reel, and agree a pickup date.`}
      />
      <CheckInForm
        technicians={options.technicians.map(({ id, name }) => ({ id, name }))}
        me={{ id: principal.id, role: principal.role }}
        suggestion={{
          promisedOn: suggestion.promisedOn,
          businessDays: suggestion.businessDays,
          basis: suggestion.basis,
          sampleSize: suggestion.sampleSize,
          today: suggestion.today,
        }}
      />
    </>
  );
}
