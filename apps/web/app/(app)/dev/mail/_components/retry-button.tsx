'use client';

import { useRouter } from 'next/navigation';
import { useState, useTransition } from 'react';
import { fetchJson } from '~/lib/api-client';

/** Sends the outbox's due messages now and reloads the list. */
export function RetryButton() {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [status, setStatus] = useState('');
  const retry = async () => {
    setStatus('');
    try {
      const result = await fetchJson<{ sent: number; failed: number; skipped?: string }>(
        '/api/dev/mail/retry',
        { method: 'POST' },
      );
      setStatus(
        result.skipped
          ? `Not sent: ${result.skipped}`
          : `Sent ${result.sent}, failed ${result.failed}.`,
      );
    } catch (e) {
      setStatus(e instanceof Error ? e.message : 'The retry failed.');
    }
    startTransition(() => router.refresh());
  };
  return (
    <div className="flex items-center gap-3">
      <p role="status" className="text-slate-700">
        {status}
      </p>
      <button
        type="button"
        onClick={retry}
        disabled={pending}
        className="min-h-11 rounded-md bg-sea-700 px-4 font-medium text-white hover:bg-sea-800 disabled:opacity-60"
      >
        Send what is due now
      </button>
    </div>
  );
}
