// POST /api/auth/password-reset/confirm – set a password from an e-mailed invitation or reset link (once; 410 when used, withdrawn or expired)
import { passwordResetConfirm } from '~/lib/validators/people';
import { publicRoute } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';
import { setPasswordFromLink } from '~/server/people';

export const dynamic = 'force-dynamic';

export const POST = publicRoute({ body: passwordResetConfirm }, async ({ body }) =>
  setPasswordFromLink(body),
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
