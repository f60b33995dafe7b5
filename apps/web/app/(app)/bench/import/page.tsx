import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { recentImports } from '~/server/imports/history';
import { getShop } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { ImportScreen } from './_components/import-screen';

export const metadata: Metadata = { title: 'Import past jobs' };
export const dynamic = 'force-dynamic';

export default async function ImportPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'jobs:import') || principal.shopId == null) return <NotAllowed />;
  const [shop, history] = await Promise.all([
    getShop(principal, principal.shopId),
    recentImports(principal),
  ]);
  return (
    <>
      <PageHeader
        title="Import past jobs"
        lead={`Bring ${shop.name}'s jobs over from another system with a CSV file. Every row is checked first; then all of them are imported together, or none.`}
        actions={
          <Link
            href="/bench"
            className="min-h-11 rounded-md border border-slate-400 bg-white px-4 py-2.5 font-medium text-slate-800 hover:bg-sand-100"
          >
            Back to the bench
          </Link>
        }
      />
      <ImportScreen shopName={shop.name} timeZone={shop.timeZone} history={history} />
    </>
  );
}
