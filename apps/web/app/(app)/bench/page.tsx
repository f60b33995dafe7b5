import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import Link from 'next/link';
import { Suspense } from 'react';
import { NotAllowed, PageHeader } from '~/components/ui';
import { can } from '~/lib/permissions';
import { asJson, jobKeys, listParams } from '~/lib/queries/jobs';
import { jobListQuery } from '~/lib/validators/jobs';
import { benchListOptions, listJobs } from '~/server/queries/bench';
import { requirePagePrincipal } from '~/server/session';
import { JobList } from './_components/job-list';

export const metadata: Metadata = { title: 'Bench' };
export const dynamic = 'force-dynamic';

export default async function BenchPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'jobs:read')) return <NotAllowed />;
  const raw = await searchParams;
  const params = listParams(
    Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v])),
  );
  const parsed = jobListQuery.safeParse(params);
  const options = await benchListOptions(principal);
  const queryClient = new QueryClient();
  // A URL the schema refuses shows the default view; the list says which filter was ignored.
  if (parsed.success) {
    queryClient.setQueryData(jobKeys.list(params), asJson(await listJobs(principal, parsed.data)));
  }
  const canWrite = can(principal.role, 'jobs:write');
  const single = options.shops.length === 1 ? options.shops[0] : undefined;
  return (
    <>
      <PageHeader
        title="Bench"
        lead={
          single
            ? `Every job at ${single.name}. Filter, sort and search; times are ${single.timeZone.replace('_', ' ')}.`
            : `Jobs across the ${options.shops.length} shops in your view. Pick a shop to narrow the list.`
        }
        actions={
          canWrite ? (
            <div className="flex flex-wrap gap-3">
              {can(principal.role, 'jobs:import') && (
                <Link
                  href="/bench/import"
                  className="inline-flex min-h-12 items-center rounded-md border border-sea-700 bg-white px-5 text-lg font-semibold text-sea-800 hover:bg-sea-50"
                >
                  Import past jobs
                </Link>
              )}
              <Link
                href="/bench/new"
                className="inline-flex min-h-12 items-center rounded-md bg-sea-700 px-5 text-lg font-semibold text-white hover:bg-sea-800"
              >
                Check a reel in
              </Link>
            </div>
          ) : undefined
        }
      />
      <HydrationBoundary state={dehydrate(queryClient)}>
        <Suspense>
          <JobList
            shops={options.shops}
            technicians={options.technicians}
            invalidQuery={parsed.success ? null : parsed.error.issues.map((i) => i.path.join('.'))}
          />
        </Suspense>
      </HydrationBoundary>
    </>
  );
}
