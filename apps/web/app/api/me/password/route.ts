// PUT /api/me/password – the signed-in person changes their password (the current one required); every session of theirs ends
import { passwordChange } from '~/lib/validators/people';
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';
import { changeOwnPassword } from '~/server/people';

export const PUT = route(
  { permission: 'account:write', body: passwordChange },
  async ({ principal, body }) => changeOwnPassword(principal, body),
);

export const { DELETE, GET, PATCH, POST, OPTIONS } = otherMethods(['PUT']);
