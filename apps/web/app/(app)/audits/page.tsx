import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can } from '~/lib/permissions';
import { roundsQuery } from '~/lib/queries/audits';
import { listRounds } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import { RoundsTable } from './_components/rounds-table';

export const metadata: Metadata = { title: 'Audits' };
export const dynamic = 'force-dynamic';

export default async function AuditsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'audits:read')) return <NotAllowed />;
  const rounds = await listRounds(principal);
  const queryClient = new QueryClient();
  queryClient.setQueryData(roundsQuery().queryKey, { rounds });
  const planner = can(principal.role, 'audits:plan');
  const auditor = principal.role === 'auditor';
  const lead = auditor
    ? 'The rounds assigned to you. Score each sampled job from its record and photos; you can save part-way and come back.'
    : planner
      ? 'Each round samples a shop’s finished jobs at random by ISO 2859-1 and accepts or rejects the lot from the auditor’s scores.'
      : 'Decided audit rounds of your shop, with their reports.';
  return (
    <>
      <PageHeader
        title={auditor ? 'Your audit rounds' : 'Audits'}
        lead={lead}
        actions={
          planner ? (
            <Link
              href="/audits/new"
              className="inline-flex min-h-11 items-center rounded-md bg-sea-700 px-4 font-semibold text-white hover:bg-sea-800"
            >
              Plan a round
            </Link>
          ) : undefined
        }
      />
      <Panel title="Rounds" description="Newest period first.">
        <HydrationBoundary state={dehydrate(queryClient)}>
          <RoundsTable auditor={auditor} />
        </HydrationBoundary>
      </Panel>
    </>
  );
}
