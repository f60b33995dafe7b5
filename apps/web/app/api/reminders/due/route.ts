// GET /api/reminders/due?shop=&weeks= – reels of the shop's customers due for a service in the coming weeks, with who will get a reminder
import { dueQuery } from '~/lib/validators/reminders';
import { route } from '~/server/api';
import { badRequest } from '~/server/errors';
import { dueReminders } from '~/server/reminders/due';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'reminders:send', query: dueQuery },
  async ({ principal, query }) => {
    const shopId = query.shop ?? principal.shopId;
    if (shopId == null)
      throw badRequest('Name the shop.', [{ field: 'query.shop', message: 'Required' }]);
    return dueReminders(principal, shopId, query.weeks);
  },
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
