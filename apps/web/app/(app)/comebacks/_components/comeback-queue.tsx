'use client';

import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { usePathname, useRouter } from 'next/navigation';
import { useId } from 'react';
import { Empty, Stat } from '~/components/ui';
import { formatCount } from '~/lib/format';
import { comebackListQuery } from '~/lib/queries/comebacks';
import { COMEBACK_STATUS_LABELS, type ComebackStatusValue } from '~/lib/comebacks';
import type { ComebackRow } from '~/server/queries/comebacks';
import { ComebackStatusBadge, PastDeadlineBadge } from './badges';
import { daysPast, days, onDate } from './format';

export type StatusFilter = ComebackStatusValue | 'all';

const FILTERS: { value: StatusFilter; label: string }[] = [
  { value: 'open', label: COMEBACK_STATUS_LABELS.open },
  { value: 'confirmed', label: COMEBACK_STATUS_LABELS.confirmed },
  { value: 'dismissed', label: COMEBACK_STATUS_LABELS.dismissed },
  { value: 'all', label: 'All' },
];

/** The review queues, one table per shop that did the original work. */
export function ComebackQueue(props: { status: StatusFilter; shop?: number }) {
  const query = {
    status: props.status === 'all' ? undefined : props.status,
    shop: props.shop,
  };
  const { data, isPending, isError, error } = useQuery(comebackListQuery(query));
  const router = useRouter();
  const pathname = usePathname();
  const statusId = useId();
  const shopId = useId();
  if (isPending) return <p className="text-slate-600">Loading the comebacks…</p>;
  if (isError)
    return (
      <p role="alert" className="text-brick-700">
        Could not load the comebacks: {error.message}
      </p>
    );

  const go = (next: { status?: StatusFilter; shop?: number | null }) => {
    const status = next.status ?? props.status;
    const shop = next.shop === undefined ? props.shop : next.shop;
    const params = new URLSearchParams();
    if (status !== 'open') params.set('status', status);
    if (shop != null) params.set('shop', String(shop));
    const qs = params.toString();
    router.replace(qs ? `${pathname}?${qs}` : pathname, { scroll: false });
  };

  const overdue = data.comebacks.filter((c) => c.overdue).length;
  const groups = new Map<number, { name: string; rows: ComebackRow[] }>();
  for (const c of data.comebacks) {
    const group = groups.get(c.originalJob.shopId) ?? { name: c.originalJob.shopName, rows: [] };
    group.rows.push(c);
    groups.set(c.originalJob.shopId, group);
  }
  const ordered = [...groups.entries()].sort((a, b) => a[1].name.localeCompare(b[1].name));
  const deadline = days(data.settings.reviewDeadlineDays);

  return (
    <>
      <dl className="mb-6 grid grid-cols-2 gap-4 lg:grid-cols-4">
        <Stat
          label="To review"
          value={formatCount(data.counts.open)}
          hint={props.shop ? 'At this shop' : 'At your shops'}
        />
        <Stat
          label="Past the review deadline"
          value={props.status === 'open' || props.status === 'all' ? formatCount(overdue) : '—'}
          hint={`Open longer than ${deadline}`}
        />
        <Stat label="Confirmed" value={formatCount(data.counts.confirmed)} hint="All time" />
        <Stat label="Dismissed" value={formatCount(data.counts.dismissed)} hint="All time" />
      </dl>

      <div
        className="mb-6 flex flex-wrap items-end gap-4"
        role="search"
        aria-label="Filter comebacks"
      >
        <div>
          <label htmlFor={statusId} className="block font-medium text-slate-800">
            Status
          </label>
          <select
            id={statusId}
            value={props.status}
            onChange={(e) => go({ status: e.target.value as StatusFilter })}
            className="mt-1 min-h-11 rounded-md border border-slate-400 bg-white px-3"
          >
            {FILTERS.map((f) => (
              <option key={f.value} value={f.value}>
                {f.label}
              </option>
            ))}
          </select>
        </div>
        {data.shops.length > 1 && (
          <div>
            <label htmlFor={shopId} className="block font-medium text-slate-800">
              Shop
            </label>
            <select
              id={shopId}
              value={props.shop ?? ''}
              onChange={(e) => go({ shop: e.target.value ? Number(e.target.value) : null })}
              className="mt-1 min-h-11 rounded-md border border-slate-400 bg-white px-3"
            >
              <option value="">All your shops</option>
              {data.shops.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
          </div>
        )}
        <p className="pb-2 text-slate-700" aria-live="polite">
          {formatCount(data.comebacks.length)}{' '}
          {data.comebacks.length === 1 ? 'comeback' : 'comebacks'} shown
          {data.truncated ? ' (the latest; narrow the filters to see older ones)' : ''}. Review
          within {deadline} of the return.
        </p>
      </div>

      {ordered.length === 0 ? (
        <div className="rounded-lg border border-sand-200 bg-white">
          <Empty>
            {props.status === 'open'
              ? 'No comebacks waiting for review.'
              : 'No comebacks match these filters.'}
          </Empty>
        </div>
      ) : (
        <div className="space-y-8">
          {ordered.map(([id, group]) => (
            <ShopQueue key={id} shopId={id} name={group.name} rows={group.rows} asOf={data.asOf} />
          ))}
        </div>
      )}
    </>
  );
}

function ShopQueue(props: { shopId: number; name: string; rows: ComebackRow[]; asOf: string }) {
  const headingId = `queue-${props.shopId}`;
  const open = props.rows.filter((r) => r.status === 'open').length;
  const late = props.rows.filter((r) => r.overdue).length;
  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-sand-200 px-5 py-4">
        <h2 id={headingId} className="text-lg font-semibold text-slate-900">
          {props.name}
        </h2>
        <p className="text-slate-700">
          {open > 0 ? `${formatCount(open)} to review` : 'Nothing to review'}
          {late > 0 ? `, ${formatCount(late)} past the deadline` : ''}
        </p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[60rem] table-fixed text-left">
          <caption className="sr-only">
            Comebacks of {props.name}&apos;s work
            {open > 0 ? ', open ones oldest first' : ''}
          </caption>
          {/* The same widths in every shop's table, so the queues line up. */}
          <colgroup>
            <col className="w-[11rem]" />
            <col />
            <col className="w-[12rem]" />
            <col className="w-[6.5rem]" />
            <col className="w-[6.5rem]" />
            <col className="w-[12.5rem]" />
          </colgroup>
          <thead>
            <tr className="border-b border-sand-300 text-sm text-slate-600">
              <th scope="col" className="py-2 pr-3 pl-5 font-medium">
                Comeback
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Reel and customer
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Came back
              </th>
              <th scope="col" className="num py-2 pr-3 font-medium">
                Days after collection
              </th>
              <th scope="col" className="num py-2 pr-3 font-medium">
                Age
              </th>
              <th scope="col" className="py-2 pr-5 pl-3 font-medium">
                Review
              </th>
            </tr>
          </thead>
          <tbody>
            {props.rows.map((c) => (
              <QueueRow key={c.id} c={c} asOf={props.asOf} />
            ))}
          </tbody>
        </table>
      </div>
    </section>
  );
}

function QueueRow({ c, asOf }: { c: ComebackRow; asOf: string }) {
  const tz = c.originalJob.timeZone;
  const elsewhere = c.returnJob.shopId !== c.originalJob.shopId;
  return (
    <tr
      className={`border-b border-sand-100 align-top ${c.overdue ? 'bg-brick-50/60 shadow-[inset_6px_0_0_var(--color-brick-700)]' : ''}`}
    >
      <th scope="row" className="py-3 pr-3 pl-5 font-medium">
        <Link
          href={`/comebacks/${c.id}`}
          className="whitespace-nowrap text-sea-700 underline underline-offset-2 hover:text-sea-900"
        >
          Comeback #{c.id}
        </Link>
        <span className="block text-sm font-normal text-slate-600">
          {c.detection === 'automatic' ? 'Flagged at check-in' : 'Linked by hand'}
        </span>
      </th>
      <td className="py-3 pr-3">
        <span className="block font-medium text-slate-900">{c.reel}</span>
        <span className="block text-sm text-slate-700">{c.customerName}</span>
        {c.symptom && (
          <span className="mt-0.5 block max-w-xs text-sm text-slate-600">“{c.symptom}”</span>
        )}
      </td>
      <td className="py-3 pr-3">
        <span className="block">
          Job #{c.returnJob.id}, {onDate(c.returnJob.checkedInAt, tz)}
        </span>
        <span className="block text-sm text-slate-700">
          {elsewhere ? `To ${c.returnJob.shopName}` : 'To this shop'} · after job #
          {c.originalJob.id}
        </span>
      </td>
      <td className="num py-3 pr-3">
        {c.daysSinceCollection}
        {!c.insideWindow && (
          <span className="block text-sm text-slate-600">outside the window</span>
        )}
      </td>
      <td className="num py-3 pr-3">
        {days(c.ageDays)}
        <span className="block text-sm text-slate-600">
          {c.status === 'open' ? `due ${onDate(c.dueAt, tz)}` : `to review`}
        </span>
      </td>
      <td className="py-3 pr-5 pl-3">
        <div className="flex flex-col items-start gap-1.5">
          {c.overdue && <PastDeadlineBadge days={daysPast(c.dueAt, asOf)} />}
          <ComebackStatusBadge status={c.status} attribution={c.attribution} />
          <span className="text-sm text-slate-700">
            {c.status === 'open'
              ? c.assignee
                ? `Assigned to ${c.assignee.name}`
                : 'The shop lead'
              : c.reviewerName
                ? `By ${c.reviewerName}${c.rootCause ? ` · ${c.rootCause}` : ''}`
                : (c.rootCause ?? '')}
          </span>
        </div>
      </td>
    </tr>
  );
}
