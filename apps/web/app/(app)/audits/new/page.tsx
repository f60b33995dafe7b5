import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { addDays, localToday } from '~/server/audits/sampling';
import { planningOptions } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import { PlanForm } from '../_components/plan-form';

export const metadata: Metadata = { title: 'Plan an audit round' };
export const dynamic = 'force-dynamic';

/** The previous calendar month of a local date: the usual period of a round. */
function lastMonth(today: string) {
  const firstOfThisMonth = `${today.slice(0, 7)}-01`;
  const to = addDays(firstOfThisMonth, -1);
  return { from: `${to.slice(0, 7)}-01`, to };
}

export default async function PlanRoundPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'audits:plan')) return <NotAllowed />;
  const options = await planningOptions(principal);
  const shops = options.shops.map((s) => ({ ...s, today: localToday(s.timeZone) }));
  const first = shops[0];
  return (
    <>
      <p className="mb-2">
        <Link href="/audits" className="text-sea-700 underline underline-offset-2">
          ← Audits
        </Link>
      </p>
      <PageHeader
        title="Plan an audit round"
        lead="Choose a shop and a period. The lot is every job that became ready in it; the sampling plan follows ISO 2859-1 at the shop’s inspection severity, and the sample is drawn at random."
      />
      {first ? (
        <PlanForm
          shops={shops}
          auditors={options.auditors}
          defaults={{ ...options.defaults, shopId: first.id, ...lastMonth(first.today) }}
          form={options.form}
        />
      ) : (
        <p>There are no active shops in your view.</p>
      )}
    </>
  );
}
