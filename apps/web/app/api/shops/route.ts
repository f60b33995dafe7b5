// GET /api/shops – the shops the caller can see, with region, time zone and counts of open work
import { route } from '~/server/api';
import { listShops } from '~/server/queries/shops';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'shops:read' }, async ({ principal }) => ({
  shops: await listShops(principal),
}));

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
