import { and, eq, ne, type Db } from '@reelwright/db';
import { paymentEvents, royaltyInvoices } from '@reelwright/db/schema';
import Stripe from 'stripe';
import { ApiError, badRequest } from '../errors';
import { isUniqueViolation } from '../month-close/close';
import { readBodyBytes } from '../request-guards';

export interface WebhookOutcome {
  received: true;
  type: string;
  /** False when the event was already recorded (a redelivery changes nothing). */
  recorded: boolean;
  royaltyInvoiceId: number | null;
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
 * secret, stamped within five minutes of now either way) and records invoice.paid / invoice.payment_failed against the
 * royalty invoice: the event in payment_events (once per event id) and the invoice's status. A
 * missing or wrong signature is a 400 before anything is read or written.
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
  return conn
    .transaction(async (tx) => {
      const [royalty] = invoice.id
        ? await tx
            .select()
            .from(royaltyInvoices)
            .where(eq(royaltyInvoices.stripeInvoiceId, invoice.id))
            .for('update')
        : [];
      try {
        await tx.insert(paymentEvents).values({
          providerEventId: event.id,
          type: event.type,
          royaltyInvoiceId: royalty?.id ?? null,
          payload: event as unknown as Record<string, unknown>,
          receivedAt: now,
        });
      } catch (error) {
        if (isUniqueViolation(error)) throw new Redelivered();
        throw error;
      }
      if (royalty && event.type === 'invoice.paid') {
        await tx
          .update(royaltyInvoices)
          .set({ status: 'paid', paidAt: new Date(event.created * 1000) })
          .where(eq(royaltyInvoices.id, royalty.id));
      } else if (royalty && event.type === 'invoice.payment_failed') {
        // A failure reported after the payment went through (events can arrive out of order) is kept
        // as an event but does not undo "paid".
        await tx
          .update(royaltyInvoices)
          .set({ status: 'failed', failedAt: new Date(event.created * 1000) })
          .where(and(eq(royaltyInvoices.id, royalty.id), ne(royaltyInvoices.status, 'paid')));
      }
      return {
        received: true as const,
        type: event.type,
        recorded: true,
        royaltyInvoiceId: royalty?.id ?? null,
      };
    })
    .catch((error: unknown) => {
      if (error instanceof Redelivered)
        return {
          received: true as const,
          type: event.type,
          recorded: false,
          royaltyInvoiceId: null,
        };
      throw error;
    });
}

class Redelivered extends Error {}
