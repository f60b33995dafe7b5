// POST /api/auth/password-reset – e-mail a one-time link to set a new password; the same answer whether or not the address has an account
import { passwordResetRequest } from '~/lib/validators/people';
import { publicRoute } from '~/server/api';
import { deliverSoon } from '~/server/mail/deliver-soon';
import { otherMethods } from '~/server/method-not-allowed';
import { requestPasswordReset } from '~/server/people';

export const dynamic = 'force-dynamic';

export const POST = publicRoute({ body: passwordResetRequest }, async ({ body }) => {
  const { queued } = await requestPasswordReset(body.email);
  if (queued) deliverSoon();
  return Response.json(
    { detail: 'If this address has an account, a link to set a new password is on its way.' },
    { status: 202 },
  );
});

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
