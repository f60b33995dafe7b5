// POST /api/month-close/{YYYY-MM}/reopen – reopen a closed month with a reason; the close stays on record (owner)
import { monthParams, reopenInput } from '~/lib/validators/month-close';
import { route } from '~/server/api';
import { reopenMonth } from '~/server/month-close/close';
import { getMonthClose } from '~/server/queries/month-close';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'month-close:manage', params: monthParams, body: reopenInput },
  async ({ principal, params, body }) => {
    await reopenMonth(principal, params.month, body.reason);
    return getMonthClose(principal, params.month);
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
