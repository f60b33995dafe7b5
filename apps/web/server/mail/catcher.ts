import { sql } from '@reelwright/db';
import { emails } from '@reelwright/db/schema';
import { env } from '~/env';
import { db } from '../db';

/** A message as the local SMTP catcher (scripts/fakes.mjs) received it. */
export interface CaughtMessage {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  from: string | null;
  to: string | null;
  subject: string;
  text: string;
  html: string | null;
}

/** The catcher is for development and tests; in production it exists only when configured. */
export const catcherConfigured = () => Boolean(env.MAIL_CATCHER_URL);

export async function caughtMessages(to?: string): Promise<CaughtMessage[]> {
  if (!env.MAIL_CATCHER_URL) return [];
  const url = new URL('/messages', env.MAIL_CATCHER_URL);
  if (to) url.searchParams.set('to', to);
  const response = await fetch(url, { cache: 'no-store', signal: AbortSignal.timeout(5_000) });
  if (!response.ok) throw new Error(`The mail catcher answered ${response.status}`);
  return ((await response.json()) as { messages: CaughtMessage[] }).messages;
}

/** How many outbox messages are in each state, and the latest delivery error. */
export async function outboxSummary() {
  const conn = await db();
  const { rows } = await conn.execute<{
    status: string;
    n: number | string;
    last_error: string | null;
  }>(
    sql`select ${emails.status} as status, count(*) as n,
          (array_agg(${emails.lastError} order by ${emails.id} desc)
            filter (where ${emails.lastError} is not null))[1] as last_error
        from ${emails} group by ${emails.status}`,
  );
  const count = (s: string) => Number(rows.find((r) => r.status === s)?.n ?? 0);
  return {
    pending: count('pending'),
    sent: count('sent'),
    failed: count('failed'),
    /** Gave up after every retry: listed on the settings page with a resend button. */
    dead: count('dead'),
    lastError:
      rows.find((r) => r.status === 'failed')?.last_error ??
      rows.find((r) => r.status === 'dead')?.last_error ??
      null,
  };
}
