// POST /api/mail/resend – put an undelivered (dead) message back in the outbox and send it again (owner)
import { resendMailInput } from '~/lib/validators/mail';
import { route } from '~/server/api';
import { db } from '~/server/db';
import { notFound } from '~/server/errors';
import { resendEmail } from '~/server/mail/outbox';
import { otherMethods } from '~/server/method-not-allowed';
import { deliverMailSoon } from '~/server/queue';

export const POST = route(
  { permission: 'settings:manage', body: resendMailInput },
  async ({ body }) => {
    // Only a dead message is put back; anything else (missing, already back, sent) is not found
    // among the undelivered, so a second click sends nothing more.
    if (!(await resendEmail(await db(), body.id))) throw notFound('undelivered message');
    void deliverMailSoon();
    return { id: body.id, status: 'pending' as const };
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
