// POST /api/webhooks/payments – payment-provider webhook (at most 64 kB, stamped within 5 minutes): verifies the signature, records paid and failed royalty invoices
import type { NextRequest } from 'next/server';
import { env } from '~/env';
import { db } from '~/server/db';
import { problemResponse } from '~/server/errors';
import { handlePaymentWebhook, readWebhookBody } from '~/server/payments/webhook';
import { otherMethods } from '~/server/method-not-allowed';
import { enqueue, QUEUES } from '~/server/queue';

// No session here: the Stripe-Signature over the raw body is the caller's proof.
export async function POST(request: NextRequest) {
  try {
    const payload = await readWebhookBody(request);
    const outcome = await handlePaymentWebhook(
      await db(),
      payload,
      request.headers.get('stripe-signature'),
      env.STRIPE_WEBHOOK_SECRET,
    );
    // The stored event is applied by the payment-event job (and the minute's sweep, should this
    // instance stop before it runs); the provider only needs to know it was received.
    const { eventId, ...answer } = outcome;
    if (eventId) void enqueue(QUEUES.paymentEvent, { eventId });
    return Response.json(answer);
  } catch (error) {
    return problemResponse(error, request.nextUrl.pathname);
  }
}

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
