import { and, eq, ne, type Db } from '@reelwright/db';
import { paymentEvents, royaltyInvoices } from '@reelwright/db/schema';
import Stripe from 'stripe';
import { ApiError, badRequest } from '../errors';
import { isUniqueViolation } from '../month-close/close';

export interface WebhookOutcome {
  received: true;
  type: string;
  /** False when the event was already recorded (a redelivery changes nothing). */
  recorded: boolean;
  royaltyInvoiceId: number | null;
}

const HANDLED = new Set(['invoice.paid', 'invoice.payment_failed']);

/**
 * Verifies a payment-provider webhook (Stripe-Signature over the raw body with the endpoint's
 * secret, five minutes' tolerance) and records invoice.paid / invoice.payment_failed against the
 * royalty invoice: the event in payment_events (once per event id) and the invoice's status. A
 * missing or wrong signature is a 400 before anything is read or written.
 */
export async function handlePaymentWebhook(
  conn: Db,
  payload: string,
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
    event = Stripe.webhooks.constructEvent(payload, signature, secret);
  } catch {
    throw badRequest('The webhook signature does not verify.');
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
