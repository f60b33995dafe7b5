// GET, PATCH /api/comebacks/{id} – one comeback with both jobs and the redo cost; review it, open a corrective action or reassign it
import { comebackPatch } from '~/lib/validators/comebacks';
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { deliverSoon } from '~/server/audits/deliver';
import { updateComeback } from '~/server/comebacks/review';
import { getComeback } from '~/server/queries/comebacks';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'comebacks:read', params: idParams },
  async ({ principal, params }) => getComeback(principal, params.id),
);

export const PATCH = route(
  { permission: 'comebacks:review', params: idParams, body: comebackPatch },
  async ({ principal, params, body }) => {
    const { comeback, emailsQueued } = await updateComeback(principal, params.id, body);
    // The new assignee's e-mail leaves after the response.
    if (emailsQueued > 0) deliverSoon();
    return comeback;
  },
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
