// POST /api/users/{id}/invite – resend a person's invitation (a fresh link) or withdraw it (owner)
import { idParams } from '~/lib/validators/common';
import { inviteAction } from '~/lib/validators/people';
import { route } from '~/server/api';
import { deliverSoon } from '~/server/mail/deliver-soon';
import { otherMethods } from '~/server/method-not-allowed';
import { invitationAction } from '~/server/people';

export const POST = route(
  { permission: 'users:manage', params: idParams, body: inviteAction },
  async ({ principal, params, body }) => {
    const person = await invitationAction(principal, params.id, body);
    if (body.action === 'resend') deliverSoon();
    return person;
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
