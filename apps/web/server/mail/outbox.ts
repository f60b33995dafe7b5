import { and, asc, desc, eq, inArray, lt, lte, sql, type Db, type Tx } from '@reelwright/db';
import { emails, type EmailKind } from '@reelwright/db/schema';
import nodemailer, { type Transporter } from 'nodemailer';
import { env } from '~/env';
import { db as appDb } from '../db';
import * as clock from '~/server/clock';

export interface QueuedEmail {
  kind: EmailKind;
  to: string;
  subject: string;
  text: string;
  html?: string;
  jobId?: number;
  shopId?: number;
  /** What the message is about, for links and de-duplication (e.g. 'job', 12). */
  entityType?: string;
  entityId?: number;
  /** A one-click opt-out URL (RFC 8058), for messages a customer can stop. */
  listUnsubscribeUrl?: string;
}

/**
 * Writes a message to the outbox inside the caller's transaction, so it exists exactly when the
 * change that causes it commits. Nothing is sent here: call `deliverPending()` after the commit
 * (preferably from `after()` in next/server so the response does not wait for SMTP).
 */
export async function queueEmail(tx: Tx | Db, message: QueuedEmail): Promise<number> {
  const [row] = await tx
    .insert(emails)
    .values({
      kind: message.kind,
      toAddress: message.to,
      fromAddress: env.MAIL_FROM,
      subject: message.subject,
      textBody: message.text,
      htmlBody: message.html ?? null,
      status: 'pending',
      jobId: message.jobId ?? null,
      shopId: message.shopId ?? null,
      entityType: message.entityType ?? (message.jobId ? 'job' : null),
      entityId: message.entityId ?? message.jobId ?? null,
      listUnsubscribeUrl: message.listUnsubscribeUrl ?? null,
    })
    .returning({ id: emails.id });
  if (!row) throw new Error('queueEmail: insert returned no row');
  return row.id;
}

/**
 * After this many attempts a message is `dead`: no longer retried, shown to the owner with its last
 * error (settings, "Undelivered mail") until they resend it.
 */
export const MAX_ATTEMPTS = 8;
/** How long a claimed message is reserved for the caller sending it. */
const CLAIM_LEASE_MS = 5 * 60_000;

/** Wait before the next attempt: 1, 2, 4 … minutes after each failure, at most 6 hours. */
export function retryDelayMs(attempts: number): number {
  return Math.min(60_000 * 2 ** Math.max(0, attempts - 1), 6 * 3_600_000);
}

export interface DeliverOptions {
  /** Database to read the outbox from (tests pass an in-memory one). */
  db?: Db;
  /** SMTP URL; default env.SMTP_URL. */
  smtpUrl?: string;
  /** A ready transport (tests); overrides smtpUrl. */
  transport?: Transporter;
  /** "Now" for due times and backoff; tests move it forward to see retries. */
  now?: Date;
  /** Most messages handled in one call. */
  limit?: number;
}

export interface DeliverResult {
  sent: number;
  failed: number;
  /** Why nothing was attempted (no SMTP configured, or the outbox could not be read). */
  skipped?: string;
}

const transports = new Map<string, Transporter>();

function transportFor(url: string): Transporter {
  let transport = transports.get(url);
  if (!transport) {
    // Short timeouts: a dead SMTP server should fail an attempt quickly, not hold it for minutes.
    transport = nodemailer.createTransport({
      url,
      connectionTimeout: 10_000,
      greetingTimeout: 10_000,
      socketTimeout: 20_000,
    });
    transports.set(url, transport);
  }
  return transport;
}

/**
 * Sends the messages that are due: pending ones, and failed ones whose backoff has passed. Each is
 * claimed first (its next attempt pushed out by a lease, `for update skip locked`), so two calls
 * that overlap never send the same message twice. Records sent or failed with the attempt count
 * and error. Never throws: mail must not break the change that queued it.
 */
export async function deliverPending(options: DeliverOptions = {}): Promise<DeliverResult> {
  const result: DeliverResult = { sent: 0, failed: 0 };
  const smtpUrl = options.smtpUrl ?? env.SMTP_URL;
  if (!options.transport && !smtpUrl) return { ...result, skipped: 'SMTP is not configured' };
  try {
    const conn = options.db ?? (await appDb());
    // Delivery timing is the wall clock's, as the database's default stamps the queued rows.
    const now = options.now ?? new Date();
    const leaseUntil = new Date(now.getTime() + CLAIM_LEASE_MS);
    const due = conn
      .select({ id: emails.id })
      .from(emails)
      .where(
        and(
          inArray(emails.status, ['pending', 'failed']),
          lte(emails.nextAttemptAt, now),
          lt(emails.attempts, MAX_ATTEMPTS),
        ),
      )
      .orderBy(asc(emails.nextAttemptAt), asc(emails.id))
      .limit(options.limit ?? 50)
      .for('update', { skipLocked: true });
    const claimed = await conn
      .update(emails)
      .set({ nextAttemptAt: leaseUntil, attempts: sql`${emails.attempts} + 1` })
      .where(inArray(emails.id, due))
      .returning();

    const transport = options.transport ?? transportFor(smtpUrl!);
    for (const message of claimed.sort((a, b) => a.id - b.id)) {
      try {
        const info = await transport.sendMail({
          from: message.fromAddress ?? env.MAIL_FROM,
          to: message.toAddress,
          subject: message.subject,
          text: message.textBody,
          html: message.htmlBody ?? undefined,
          ...(message.listUnsubscribeUrl && {
            list: { unsubscribe: message.listUnsubscribeUrl },
            headers: { 'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click' },
          }),
        });
        await conn
          .update(emails)
          .set({
            status: 'sent',
            sentAt: clock.now(),
            messageId: info.messageId ?? null,
            lastError: null,
          })
          .where(eq(emails.id, message.id));
        result.sent += 1;
      } catch (error) {
        result.failed += 1;
        await conn
          .update(emails)
          .set({
            status: message.attempts >= MAX_ATTEMPTS ? 'dead' : 'failed',
            lastError: describe(error),
            nextAttemptAt: new Date(now.getTime() + retryDelayMs(message.attempts)),
          })
          .where(eq(emails.id, message.id))
          .catch((e: unknown) => console.error('[mail] could not record a failure:', describe(e)));
      }
    }
  } catch (error) {
    console.error('[mail] delivering the outbox failed:', describe(error));
    return { ...result, skipped: describe(error) };
  }
  if (result.failed)
    console.warn(`[mail] ${result.failed} message(s) failed; they will be retried`);
  return result;
}

export interface UndeliveredEmail {
  id: number;
  kind: EmailKind;
  to: string;
  subject: string;
  attempts: number;
  lastError: string | null;
  createdAt: Date;
}

/** The messages that gave up (dead), newest first, with the error of their last attempt. */
export async function undeliveredEmails(conn: Db, limit = 50): Promise<UndeliveredEmail[]> {
  return conn
    .select({
      id: emails.id,
      kind: emails.kind,
      to: emails.toAddress,
      subject: emails.subject,
      attempts: emails.attempts,
      lastError: emails.lastError,
      createdAt: emails.createdAt,
    })
    .from(emails)
    .where(eq(emails.status, 'dead'))
    .orderBy(desc(emails.id))
    .limit(limit);
}

/**
 * Puts a dead message back in the outbox with its attempts reset, to be sent by the next delivery
 * run. Only a dead one: resending one that is pending, failing or sent changes nothing, so a second
 * click (or two owners at once) sends it once. Returns whether it was put back.
 */
export async function resendEmail(conn: Db | Tx, id: number): Promise<boolean> {
  const rows = await conn
    .update(emails)
    .set({ status: 'pending', attempts: 0, nextAttemptAt: new Date() })
    .where(and(eq(emails.id, id), eq(emails.status, 'dead')))
    .returning({ id: emails.id });
  return rows.length > 0;
}

function describe(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.slice(0, 500);
}
