import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { NotAllowed } from '~/components/ui';
import { can } from '~/lib/permissions';
import { comebackKeys } from '~/lib/queries/comebacks';
import { asJson, jobKeys } from '~/lib/queries/jobs';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { getJobDetail } from '~/server/queries/bench';
import { jobComeback } from '~/server/queries/comebacks';
import { requirePagePrincipal } from '~/server/session';
import { JobView } from './_components/job-view';

export const dynamic = 'force-dynamic';

export async function generateMetadata({
  params,
}: {
  params: Promise<{ id: string }>;
}): Promise<Metadata> {
  return { title: `Job #${(await params).id}` };
}

export default async function JobPage({ params }: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'jobs:read')) return <NotAllowed />;
  const id = idParam.safeParse((await params).id);
  if (!id.success) notFound();
  let job;
  try {
    job = await getJobDetail(principal, id.data);
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  const queryClient = new QueryClient();
  queryClient.setQueryData(jobKeys.detail(job.id), asJson(job));
  queryClient.setQueryData(comebackKeys.job(job.id), await jobComeback(principal, job.id));
  return (
    <HydrationBoundary state={dehydrate(queryClient)}>
      <JobView id={job.id} canWrite={can(principal.role, 'jobs:write')} />
    </HydrationBoundary>
  );
}
