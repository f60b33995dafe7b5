import Link from 'next/link';
import type { ReactNode } from 'react';
import { Empty, StateBadge } from '~/components/ui';
import { formatInZone } from '~/lib/format';
import { SERVICE_LABELS } from '~/lib/labels';
import type { JobState } from '~/lib/labels';

export interface OpenJobsTableRow {
  id: number;
  state: JobState;
  serviceType: string;
  customerName: string;
  reel: string;
  technicianName: string | null;
  /** A Date on the server, an ISO string once it has crossed to a client component. */
  checkedInAt: Date | string;
  daysOpen: number;
}

/** Open jobs with their age, on the home page and on a shop's page. */
export function OpenJobsTable(props: {
  rows: readonly OpenJobsTableRow[];
  timeZone: string;
  caption: string;
  showTechnician?: boolean;
  empty?: ReactNode;
  href?: (id: number) => string;
}) {
  const href = props.href ?? ((id: number) => `/bench/jobs/${id}`);
  if (props.rows.length === 0)
    return <Empty>{props.empty ?? 'No open jobs. Every reel is collected.'}</Empty>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[44rem] text-left">
        <caption className="sr-only">{props.caption}</caption>
        <thead>
          <tr className="border-b border-sand-300 text-sm text-slate-600">
            <th scope="col" className="py-2 pr-4 font-medium">
              Job
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Customer and reel
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              Service
            </th>
            <th scope="col" className="py-2 pr-4 font-medium">
              State
            </th>
            {props.showTechnician && (
              <th scope="col" className="py-2 pr-4 font-medium">
                Technician
              </th>
            )}
            <th scope="col" className="py-2 pr-4 font-medium">
              Checked in
            </th>
            <th scope="col" className="num py-2 font-medium">
              Days open
            </th>
          </tr>
        </thead>
        <tbody>
          {props.rows.map((job) => (
            <tr key={job.id} className="border-b border-sand-100 align-top">
              <th scope="row" className="py-3 pr-4 font-medium tabular-nums">
                <Link
                  href={href(job.id)}
                  className="text-sea-700 underline-offset-2 hover:underline"
                >
                  #{job.id}
                </Link>
              </th>
              <td className="py-3 pr-4">
                <span className="block font-medium">{job.customerName}</span>
                <span className="block text-sm text-slate-600">{job.reel}</span>
              </td>
              <td className="py-3 pr-4">
                {SERVICE_LABELS[job.serviceType as keyof typeof SERVICE_LABELS] ?? job.serviceType}
              </td>
              <td className="py-3 pr-4">
                <StateBadge state={job.state} />
              </td>
              {props.showTechnician && (
                <td className="py-3 pr-4">{job.technicianName ?? 'Unassigned'}</td>
              )}
              <td className="py-3 pr-4 whitespace-nowrap">
                {formatInZone(new Date(job.checkedInAt), props.timeZone)}
              </td>
              <td className="num py-3">{job.daysOpen.toLocaleString('en-US')}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
