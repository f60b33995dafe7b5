'use client';

import { useMutation } from '@tanstack/react-query';

import { sendJson } from '~/lib/api-client';
import type { RedrawCheck as RedrawResult } from '~/server/queries/audits';

/** "Redraw and compare": the server redraws from the stored seed and lot; we show the verdict. */
export function RedrawCheck({ roundId }: { roundId: number }) {
  const check = useMutation({
    mutationFn: () => sendJson<RedrawResult>('POST', `/api/audit-rounds/${roundId}/redraw-check`),
  });
  const result = check.data;
  return (
    <div className="mt-5 border-t border-sand-200 pt-4">
      <button
        type="button"
        onClick={() => check.mutate()}
        disabled={check.isPending}
        className="inline-flex min-h-11 items-center rounded-md border border-sea-700 px-4 font-semibold text-sea-800 hover:bg-sea-50 disabled:opacity-60"
      >
        {check.isPending ? 'Redrawing…' : 'Redraw and compare'}
      </button>
      <div aria-live="polite" className="mt-3">
        {check.isError && (
          <p role="alert" className="text-brick-700">
            Could not redraw: {check.error.message}
          </p>
        )}
        {result && (
          <div
            className={`rounded-md border p-3 ${result.matches ? 'border-sea-300 bg-sea-50 text-sea-900' : 'border-brick-300 bg-brick-50 text-brick-900'}`}
          >
            <p className="font-semibold">
              {result.matches
                ? `The redraw matches: the same ${result.redrawn.length} jobs in the same order.`
                : 'The redraw does not match the stored sample.'}
            </p>
            <p className="mt-1 text-sm">
              Redrawn: {result.redrawn.map((id) => `#${id}`).join(', ')}
            </p>
            {!result.matches && (
              <p className="mt-1 text-sm">
                Stored: {result.stored.map((id) => `#${id}`).join(', ')}
              </p>
            )}
            <p className="mt-1 text-sm">
              {result.lotUnchanged
                ? `The lot counted again today is the same ${result.lotSize} jobs.`
                : `Counted again today the period has ${result.currentLotSize} ready jobs against ${result.lotSize} stored; the draw uses the stored lot.`}
            </p>
          </div>
        )}
      </div>
    </div>
  );
}
