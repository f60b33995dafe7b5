import { Panel } from '~/components/ui';
import type { MonthCloseData } from '~/lib/queries/month-close';
import { utc } from './format';

/** Every close of the month, newest first, with who reopened it and why. */
export function CloseHistory({ report }: { report: MonthCloseData }) {
  return (
    <Panel title="Close history" description="Every close of the month, newest first.">
      <ul className="space-y-3">
        {report.history.map((h) => (
          <li key={h.id} className="rounded-md border border-sand-200 px-4 py-3">
            <p className="font-medium text-slate-900">
              Closed {utc(h.closedAt)}
              {h.closedBy ? ` by ${h.closedBy}` : ''}
            </p>
            {h.reopenedAt ? (
              <p className="mt-1 text-slate-700">
                Reopened {utc(h.reopenedAt)}
                {h.reopenedBy ? ` by ${h.reopenedBy}` : ''}: “{h.reopenReason}”
              </p>
            ) : (
              <p className="mt-1 text-slate-700">The standing close.</p>
            )}
          </li>
        ))}
      </ul>
    </Panel>
  );
}
