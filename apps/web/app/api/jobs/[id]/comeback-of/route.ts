// GET, POST /api/jobs/{id}/comeback-of – the job's comeback flag and the reel's earlier collected jobs; link it to one by hand
import { comebackLinkInput } from '~/lib/validators/comebacks';
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { linkComeback } from '~/server/comebacks/detect';
import { deliverMailSoon } from '~/server/queue';
import { jobComeback } from '~/server/queries/comebacks';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'jobs:read', params: idParams },
  async ({ principal, params }) => jobComeback(principal, params.id),
);

export const POST = route(
  { permission: 'jobs:write', params: idParams, body: comebackLinkInput },
  async ({ principal, params, body }) => {
    const { comebackId, emailsQueued } = await linkComeback(principal, params.id, body);
    // Sent after the commit and never awaited: mail must not hold up or undo the link.
    if (emailsQueued > 0) void deliverMailSoon();
    return Response.json(
      { comebackId, ...(await jobComeback(principal, params.id)) },
      { status: 201, headers: { location: `/api/comebacks/${comebackId}` } },
    );
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
