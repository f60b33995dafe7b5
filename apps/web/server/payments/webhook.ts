import { and, asc, eq, isNull, ne, sql, type Db } from '@reelwright/db';
import { paymentEvents, royaltyInvoices } from '@reelwright/db/schema';
import Stripe from 'stripe';
import { ApiError, badRequest } from '../errors';
import { readBodyBytes } from '../request-guards';

export interface WebhookOutcome {
  received: true;
  type: string;
  /** False when the event was already recorded (a redelivery changes nothing). */
  recorded: boolean;
  royaltyInvoiceId: number | null;
  /** The stored event, for the job that applies it. */
  eventId?: number;
}

const HANDLED = new Set(['invoice.paid', 'invoice.payment_failed']);

/** Stripe's events are a few kB; anything near this is not one of them. */
export const WEBHOOK_MAX_BYTES = 64 * 1024;
/** How far the signed timestamp may be from our clock, either way (Stripe's own default: 5 min). */
export const WEBHOOK_TOLERANCE_SECONDS = 5 * 60;

const tooLarge = () =>
  new ApiError(
    413,
    'payload-too-large',
    'Payload too large',
    `A webhook body may be at most ${WEBHOOK_MAX_BYTES / 1024} kB.`,
  );

/**
 * The raw body, counted while it streams in: a declared or actual size over the limit is a 413
 * before more is read, and nothing is parsed until the whole body is within it.
 */
export async function readWebhookBody(request: Request): Promise<Uint8Array> {
  return Buffer.from(await readBodyBytes(request, WEBHOOK_MAX_BYTES, tooLarge));
}

/** The signed `t=` of a Stripe-Signature header, read as the Stripe library reads it (the last one). */
function signedTimestamp(header: string): number {
  let timestamp = Number.NaN;
  for (const item of header.split(',')) {
    const [key, value] = item.split('=');
    if (key === 't' && value !== undefined) timestamp = parseInt(value, 10);
  }
  return timestamp;
}

/**
 * Verifies a payment-provider webhook (Stripe-Signature over the raw body with the endpoint's
 * secret, stamped within five minutes of now either way) and stores invoice.paid /
 * invoice.payment_failed in payment_events, once per event id; `processPaymentEvents` (a queue job)
 * then applies it to the royalty invoice. A missing or wrong signature is a 400 before anything is
 * read or written.
 */
export async function handlePaymentWebhook(
  conn: Db,
  payload: string | Uint8Array,
  signature: string | null,
  secret: string | undefined,
  now = new Date(),
): Promise<WebhookOutcome> {
  if (!secret)
    throw new ApiError(
      503,
      'payments-unavailable',
      'Payments not configured',
      'STRIPE_WEBHOOK_SECRET is not set.',
    );
  if (!signature) throw badRequest('The Stripe-Signature header is missing.');
  let event: Stripe.Event;
  try {
    // The library refuses stamps too old but not ones from the future, which a leaked signing
    // secret or a skewed sender could otherwise use for events that stay valid for ever.
    event = Stripe.webhooks.constructEvent(
      payload,
      signature,
      secret,
      WEBHOOK_TOLERANCE_SECONDS,
      undefined,
      now.getTime(),
    );
  } catch {
    throw badRequest('The webhook signature does not verify.');
  }
  if (!(signedTimestamp(signature) - now.getTime() / 1000 <= WEBHOOK_TOLERANCE_SECONDS)) {
    throw badRequest(
      'The webhook is stamped more than five minutes ahead of this server’s clock; it was not accepted.',
    );
  }
  if (!HANDLED.has(event.type))
    return { received: true, type: event.type, recorded: false, royaltyInvoiceId: null };
  const invoice = event.data.object as Stripe.Invoice;
  const [royalty] = invoice.id
    ? await conn
        .select({ id: royaltyInvoices.id })
        .from(royaltyInvoices)
        .where(eq(royaltyInvoices.stripeInvoiceId, invoice.id))
    : [];
  // Stored first, processed by the payment-event job: the provider gets its answer at once, and a
  // failure while applying the event is retried by the queue instead of by the provider.
  const [stored] = await conn
    .insert(paymentEvents)
    .values({
      providerEventId: event.id,
      type: event.type,
      royaltyInvoiceId: royalty?.id ?? null,
      payload: event as unknown as Record<string, unknown>,
      receivedAt: now,
    })
    .onConflictDoNothing({ target: paymentEvents.providerEventId })
    .returning({ id: paymentEvents.id });
  return {
    received: true,
    type: event.type,
    recorded: Boolean(stored),
    royaltyInvoiceId: royalty?.id ?? null,
    ...(stored && { eventId: stored.id }),
  };
}

/**
 * The payment-event job: applies one stored event (or, without an id, every one not yet applied)
 * to its royalty invoice. The event row is locked and marked processed in the same transaction as
 * the invoice's change, so running it twice, or on two instances at once, changes the invoice
 * once. A failure is counted on the event with its message and rethrown for the queue to retry.
 */
export async function processPaymentEvents(conn: Db, eventId?: number): Promise<number> {
  const ids = eventId
    ? [eventId]
    : (
        await conn
          .select({ id: paymentEvents.id })
          .from(paymentEvents)
          .where(isNull(paymentEvents.processedAt))
          .orderBy(asc(paymentEvents.id))
          .limit(100)
      ).map((r) => r.id);
  let applied = 0;
  for (const id of ids) {
    try {
      if (await processOne(conn, id)) applied += 1;
    } catch (error) {
      await conn
        .update(paymentEvents)
        .set({
          processAttempts: sql`${paymentEvents.processAttempts} + 1`,
          lastError: (error instanceof Error ? error.message : String(error)).slice(0, 500),
        })
        .where(eq(paymentEvents.id, id));
      throw error;
    }
  }
  return applied;
}

async function processOne(conn: Db, id: number): Promise<boolean> {
  return conn.transaction(async (tx) => {
    const [event] = await tx
      .select()
      .from(paymentEvents)
      .where(and(eq(paymentEvents.id, id), isNull(paymentEvents.processedAt)))
      .for('update', { skipLocked: true });
    if (!event) return false;
    const payload = event.payload as unknown as Stripe.Event | null;
    const invoice = payload?.data.object as Stripe.Invoice | undefined;
    const [royalty] = invoice?.id
      ? await tx
          .select({ id: royaltyInvoices.id })
          .from(royaltyInvoices)
          .where(eq(royaltyInvoices.stripeInvoiceId, invoice.id))
          .for('update')
      : [];
    const at = new Date((payload?.created ?? 0) * 1000);
    if (royalty && event.type === 'invoice.paid') {
      await tx
        .update(royaltyInvoices)
        .set({ status: 'paid', paidAt: at })
        .where(eq(royaltyInvoices.id, royalty.id));
    } else if (royalty && event.type === 'invoice.payment_failed') {
      // A failure reported after the payment went through (events can arrive out of order) is kept
      // as an event but does not undo "paid".
      await tx
        .update(royaltyInvoices)
        .set({ status: 'failed', failedAt: at })
        .where(and(eq(royaltyInvoices.id, royalty.id), ne(royaltyInvoices.status, 'paid')));
    }
    await tx
      .update(paymentEvents)
      .set({
        processedAt: new Date(),
        royaltyInvoiceId: royalty?.id ?? event.royaltyInvoiceId,
        lastError: null,
      })
      .where(eq(paymentEvents.id, id));
    return true;
  });
}
