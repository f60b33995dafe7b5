// GET /api/reminders/batches?shop= – the shop's latest reminder batches, newest first
import { batchesQuery } from '~/lib/validators/reminders';
import { route } from '~/server/api';
import { badRequest } from '~/server/errors';
import { recentBatches } from '~/server/reminders/send';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'reminders:send', query: batchesQuery },
  async ({ principal, query }) => {
    const shopId = query.shop ?? principal.shopId;
    if (shopId == null)
      throw badRequest('Name the shop.', [{ field: 'query.shop', message: 'Required' }]);
    return { batches: await recentBatches(principal, shopId) };
  },
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
