import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { PageHeader, Panel, Stat } from '~/components/ui';
import { formatCount } from '~/lib/format';
import { JOB_STATE_LABELS } from '~/lib/labels';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { jobCounts, oldestOpenJobs } from '~/server/queries/jobs';
import { getShop } from '~/server/queries/shops';
import { requirePagePrincipal } from '~/server/session';
import { OpenJobsTable } from '../../_components/open-jobs-table';

export const metadata: Metadata = { title: 'Shop' };
export const dynamic = 'force-dynamic';

export default async function ShopPage({ params }: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  const id = idParam.safeParse((await params).id);
  if (!id.success) notFound();
  const asOf = new Date();
  try {
    const shop = await getShop(principal, id.data);
    const [counts, open] = await Promise.all([
      jobCounts(principal, shop.id),
      oldestOpenJobs(principal, shop.id, { limit: 15 }),
    ]);
    const n = (k: keyof typeof JOB_STATE_LABELS) => formatCount(counts.byState[k] ?? 0);
    return (
      <>
        <PageHeader
          title={shop.name}
          lead={`${shop.region.name} · times shown in ${shop.timeZone.replace('_', ' ')}`}
        />
        <dl className="mb-8 grid grid-cols-2 gap-4 lg:grid-cols-5">
          <Stat label={JOB_STATE_LABELS.checked_in} value={n('checked_in')} />
          <Stat label={JOB_STATE_LABELS.on_bench} value={n('on_bench')} />
          <Stat label={JOB_STATE_LABELS.waiting_parts} value={n('waiting_parts')} />
          <Stat label={JOB_STATE_LABELS.ready} value={n('ready')} />
          <Stat label={JOB_STATE_LABELS.collected} value={n('collected')} hint="All time" />
        </dl>
        <Panel
          title="Open jobs, oldest first"
          description="Reels not yet collected, with how long they have been in."
        >
          <OpenJobsTable
            jobs={open}
            timeZone={shop.timeZone}
            asOf={asOf}
            caption={`Open jobs at ${shop.name}, oldest first`}
            showTechnician
          />
        </Panel>
      </>
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
}
