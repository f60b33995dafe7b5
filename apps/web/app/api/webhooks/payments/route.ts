// POST /api/webhooks/payments – payment-provider webhook (at most 64 kB, stamped within 5 minutes): verifies the signature, records paid and failed royalty invoices
import type { NextRequest } from 'next/server';
import { env } from '~/env';
import { db } from '~/server/db';
import { problemResponse } from '~/server/errors';
import {
  handlePaymentWebhook,
  processPaymentEvents,
  readWebhookBody,
} from '~/server/payments/webhook';
import { otherMethods } from '~/server/method-not-allowed';
import { enqueue, QUEUES } from '~/server/queue';

// No session here: the Stripe-Signature over the raw body is the caller's proof.
export async function POST(request: NextRequest) {
  try {
    const payload = await readWebhookBody(request);
    const conn = await db();
    const outcome = await handlePaymentWebhook(
      conn,
      payload,
      request.headers.get('stripe-signature'),
      env.STRIPE_WEBHOOK_SECRET,
    );
    // The stored event is applied by the payment-event job (and the minute's sweep, should this
    // instance stop before it runs); the provider only needs to know it was received. Without a
    // queue in this process (a script, a unit test) it is applied here.
    const { eventId, ...answer } = outcome;
    if (eventId && (await enqueue(QUEUES.paymentEvent, { eventId })) === null)
      await processPaymentEvents(conn, eventId).catch((error: unknown) =>
        console.error('[payments]', error instanceof Error ? error.message : error),
      );
    return Response.json(answer);
  } catch (error) {
    return problemResponse(error, request.nextUrl.pathname);
  }
}

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
