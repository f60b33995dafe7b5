import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can } from '~/lib/permissions';
import { sampleQuery } from '~/lib/queries/audits';
import { roundSampleParams } from '~/lib/validators/audits';
import { ApiError } from '~/server/errors';
import { getSample } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import { JobRecordView } from '../../../_components/job-record';
import { ScoreForm } from '../../../_components/score-form';

export const metadata: Metadata = { title: 'Score a sampled job' };
export const dynamic = 'force-dynamic';

const linkClass =
  'inline-flex min-h-11 items-center rounded-md px-2 text-sea-700 underline underline-offset-2 hover:text-sea-900';

export default async function SamplePage({
  params,
}: {
  params: Promise<{ id: string; jobId: string }>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'audits:read')) return <NotAllowed />;
  const parsed = roundSampleParams.safeParse(await params);
  if (!parsed.success) notFound();
  const { id, jobId } = parsed.data;
  let view;
  try {
    view = await getSample(principal, id, jobId);
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  const queryClient = new QueryClient();
  queryClient.setQueryData(sampleQuery(id, jobId).queryKey, view);
  const { round } = view;
  return (
    <>
      <nav aria-label="Sampled jobs" className="mb-2 flex flex-wrap items-center gap-x-4">
        <Link href={`/audits/${id}`} className={linkClass}>
          ← Round #{id}
        </Link>
        {view.previousJobId !== null && (
          <Link href={`/audits/${id}/samples/${view.previousJobId}`} className={linkClass}>
            Previous job
          </Link>
        )}
        {view.nextJobId !== null && (
          <Link href={`/audits/${id}/samples/${view.nextJobId}`} className={linkClass}>
            Next job
          </Link>
        )}
      </nav>
      <PageHeader
        title={`Job #${jobId}`}
        lead={`Sample ${view.position} of ${round.sampleSize} in round #${id} · ${round.shop.name} · audit form version ${round.formVersion}. Times in ${round.shop.timeZone.replace('_', ' ')}.`}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_27rem]">
        <Panel title="Job record" description="Read-only: the audit cannot change the job.">
          <JobRecordView job={view.job} timeZone={round.shop.timeZone} />
        </Panel>
        <Panel
          title="Audit form"
          description={view.canScore ? 'Score from the record and photos.' : undefined}
        >
          <HydrationBoundary state={dehydrate(queryClient)}>
            <ScoreForm key={jobId} roundId={id} jobId={jobId} />
          </HydrationBoundary>
        </Panel>
      </div>
    </>
  );
}
