// GET, PUT /api/shops/{id}/calendar – a shop's weekly opening hours and closed dates (owner); saving recomputes its finished jobs' business-time turnaround
import { idParams } from '~/lib/validators/common';
import { shopCalendarInput } from '~/lib/validators/shops';
import { route } from '~/server/api';
import { saveShopCalendar, shopCalendarView } from '~/server/shops/calendar';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'settings:manage', params: idParams }, async ({ params }) =>
  shopCalendarView(params.id),
);

export const PUT = route(
  { permission: 'settings:manage', params: idParams, body: shopCalendarInput },
  async ({ principal, params, body }) => saveShopCalendar(principal, params.id, body),
);

export const { DELETE, PATCH, POST, OPTIONS } = otherMethods(['GET', 'PUT']);
