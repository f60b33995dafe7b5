// POST /api/reminders/send – start a batch of service reminders for the shop's due reels; poll the batch for progress
import { after } from 'next/server';
import { env } from '~/env';
import { sendInput } from '~/lib/validators/reminders';
import { route } from '~/server/api';
import { badRequest } from '~/server/errors';
import { deliverPending } from '~/server/mail/outbox';
import { runBatch, startReminderBatch } from '~/server/reminders/send';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'reminders:send', body: sendInput },
  async ({ principal, body, request }) => {
    const shopId = body.shopId ?? principal.shopId;
    if (shopId == null)
      throw badRequest('Name the shop.', [{ field: 'body.shopId', message: 'Required' }]);
    const started = await startReminderBatch(principal, { shopId, weeks: body.weeks });
    const baseUrl = env.APP_BASE_URL ?? env.NEXTAUTH_URL ?? request.nextUrl.origin;
    // The response names the batch at once; the sending carries on after it, recording progress.
    after(async () => {
      await runBatch(started, { baseUrl });
      await deliverPending();
    });
    return Response.json(
      { batch: started.batch, alreadyRunning: started.alreadyRunning },
      {
        status: started.alreadyRunning ? 200 : 202,
        headers: { location: `/api/reminders/batches/${started.batch.id}` },
      },
    );
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
