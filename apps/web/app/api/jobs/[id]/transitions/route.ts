// POST /api/jobs/{id}/transitions – move a job to its next state ({ to }); 409 for any other move
import { idParams } from '~/lib/validators/common';
import { transitionInput } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { transitionJob } from '~/server/bench/jobs';
import { deliverMailSoon } from '~/server/queue';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'jobs:write', params: idParams, body: transitionInput },
  async ({ principal, params, body }) => {
    const { emailQueued } = await transitionJob(principal, params.id, body);
    // Sent after the commit and never awaited: mail must not hold up or undo the move.
    if (emailQueued) void deliverMailSoon();
    return getJobDetail(principal, params.id);
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
