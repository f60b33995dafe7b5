// POST /api/month-close/{YYYY-MM}/invoices – ask for one royalty invoice per shop from the closed month; a queue job issues them (202), and issuing again never bills twice (owner)
import { monthParams } from '~/lib/validators/month-close';
import { route } from '~/server/api';
import { db } from '~/server/db';
import { otherMethods } from '~/server/method-not-allowed';
import { enqueue, QUEUES } from '~/server/queue';
import { issueRequestedRoyalties, requestRoyaltyInvoices } from '~/server/queue/royalties';

export const POST = route(
  { permission: 'month-close:manage', params: monthParams },
  async ({ principal, params }) => {
    const conn = await db();
    const request = await requestRoyaltyInvoices(conn, principal, params.month);
    // Without a queue in this process (a script, a unit test) the request is carried out here.
    if ((await enqueue(QUEUES.royalties, { month: params.month })) === null)
      await issueRequestedRoyalties(conn, params.month).catch((error: unknown) =>
        console.error('[royalties]', error instanceof Error ? error.message : error),
      );
    return Response.json(request, { status: 202 });
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
