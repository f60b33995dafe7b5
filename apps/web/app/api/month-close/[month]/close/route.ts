// POST /api/month-close/{YYYY-MM}/close – close the month for the network, freezing every shop's figures (owner)
import { monthParams } from '~/lib/validators/month-close';
import { route } from '~/server/api';
import { closeMonth } from '~/server/month-close/close';
import { getMonthClose } from '~/server/queries/month-close';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'month-close:manage', params: monthParams },
  async ({ principal, params }) => {
    await closeMonth(principal, params.month);
    return Response.json(await getMonthClose(principal, params.month), { status: 201 });
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
