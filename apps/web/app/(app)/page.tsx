import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { Panel, PageHeader, Stat } from '~/components/ui';
import { OpenJobsTable } from '~/components/open-jobs-table';
import { daysBetween, formatCount } from '~/lib/format';
import { JOB_STATE_LABELS } from '~/lib/labels';
import { roundsQuery } from '~/lib/queries/audits';
import { shopsQuery } from '~/lib/queries/shops';
import { listRounds } from '~/server/queries/audits';
import { oldestOpenJobs, jobCounts } from '~/server/queries/jobs';
import { getShop, listShops } from '~/server/queries/shops';
import type { Principal } from '~/server/principal';
import { requirePagePrincipal } from '~/server/session';
import { RoundsTable } from './audits/_components/rounds-table';
import { ShopsTable } from './_components/shops-table';
import * as clock from '~/server/clock';

export const metadata: Metadata = { title: 'Home' };
export const dynamic = 'force-dynamic';

export default async function HomePage() {
  const principal = await requirePagePrincipal();
  if (principal.scope.kind === 'rounds') return <AuditorHome principal={principal} />;
  if (principal.scope.kind === 'shop')
    return <ShopHome principal={principal} shopId={principal.scope.shopId} />;
  return <NetworkHome principal={principal} />;
}

// An auditor sees a shop only through the rounds assigned to them: no shop's live work or figures.
async function AuditorHome({ principal }: { principal: Principal }) {
  const queryClient = new QueryClient();
  const rounds = await listRounds(principal);
  queryClient.setQueryData(roundsQuery().queryKey, { rounds });
  const open = rounds.filter((r) => r.status !== 'decided' && r.status !== 'cancelled');
  return (
    <>
      <PageHeader
        title="Shops to audit"
        lead="The shops whose finished jobs an audit round assigns to you. Open a round to score its sampled jobs."
      />
      <dl className="mb-8 grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Stat label="Rounds assigned" value={formatCount(rounds.length)} />
        <Stat label="Rounds to finish" value={formatCount(open.length)} />
        <Stat
          label="Samples scored"
          value={formatCount(rounds.reduce((n, r) => n + r.scored, 0))}
        />
        <Stat
          label="Samples to score"
          value={formatCount(open.reduce((n, r) => n + Math.max(0, r.sampleSize - r.scored), 0))}
        />
      </dl>
      <HydrationBoundary state={dehydrate(queryClient)}>
        <Panel
          title="Your audit rounds"
          description="Rounds assigned to you, newest period first. Open one to score its sampled jobs."
        >
          <RoundsTable auditor />
        </Panel>
      </HydrationBoundary>
    </>
  );
}

async function NetworkHome({ principal }: { principal: Principal }) {
  const queryClient = new QueryClient();
  const shops = await listShops(principal);
  queryClient.setQueryData(shopsQuery().queryKey, { shops });
  const sum = (pick: (s: (typeof shops)[number]) => number) =>
    shops.reduce((t, s) => t + pick(s), 0);
  const regionName = principal.scope.kind === 'region' ? shops[0]?.region.name : undefined;
  const title = regionName ? `${regionName} today` : 'The network today';
  const lead = `${shops.length} shops in your view. Counts are live; "this week" runs from Monday in each shop's own time zone.`;
  return (
    <>
      <PageHeader title={title} lead={lead} />
      <dl className="mb-8 grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Stat label="Shops" value={formatCount(shops.length)} />
        <Stat
          label="Open jobs"
          value={formatCount(sum((s) => s.openJobs))}
          hint="Checked in, on the bench or waiting on parts"
        />
        <Stat label="Waiting on parts" value={formatCount(sum((s) => s.waitingOnParts))} />
        <Stat label="Ready this week" value={formatCount(sum((s) => s.readyThisWeek))} />
      </dl>
      <HydrationBoundary state={dehydrate(queryClient)}>
        <div className="space-y-8">
          <Panel title="Shops" description="Open work per shop. Select a shop for its page.">
            <ShopsTable caption="Shops in your view with their open work" />
          </Panel>
        </div>
      </HydrationBoundary>
    </>
  );
}

async function ShopHome({ principal, shopId }: { principal: Principal; shopId: number }) {
  const asOf = clock.now();
  const shop = await getShop(principal, shopId);
  const mine = principal.role === 'technician';
  const [counts, open] = await Promise.all([
    jobCounts(principal, shopId),
    oldestOpenJobs(principal, shopId, {
      technicianId: mine ? principal.id : undefined,
      benchOnly: mine,
      limit: 12,
    }),
  ]);
  const n = (k: keyof typeof JOB_STATE_LABELS) => formatCount(counts.byState[k] ?? 0);
  return (
    <>
      <PageHeader
        title={mine ? 'Your bench' : `${shop.name} today`}
        lead={
          mine
            ? `The reels assigned to you at ${shop.name} that still need work, oldest first.`
            : `${shop.region.name} · times shown in ${shop.timeZone.replace('_', ' ')}`
        }
      />
      <dl className="mb-8 grid grid-cols-2 gap-4 lg:grid-cols-5">
        <Stat label={JOB_STATE_LABELS.checked_in} value={n('checked_in')} />
        <Stat label={JOB_STATE_LABELS.on_bench} value={n('on_bench')} />
        <Stat label={JOB_STATE_LABELS.waiting_parts} value={n('waiting_parts')} />
        <Stat label={JOB_STATE_LABELS.ready} value={n('ready')} />
        <Stat label="Ready in the last 30 days" value={formatCount(counts.readyLast30Days)} />
      </dl>
      <Panel
        title={mine ? 'Your open jobs' : 'Open jobs, oldest first'}
        description={
          mine
            ? 'Jobs assigned to you that are not collected yet.'
            : 'The reels that have been in the shop longest.'
        }
      >
        <OpenJobsTable
          rows={open.map((job) => ({ ...job, daysOpen: daysBetween(job.checkedInAt, asOf) }))}
          timeZone={shop.timeZone}
          caption={mine ? 'Your open jobs' : 'Open jobs, oldest first'}
          showTechnician={!mine}
        />
      </Panel>
    </>
  );
}
