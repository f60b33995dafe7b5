// GET /api/shops – the shops the caller can see, with region, time zone and counts of open work
import { route } from '~/server/api';
import { listShops } from '~/server/queries/shops';

export const GET = route({ permission: 'shops:read' }, async ({ principal }) => ({
  shops: await listShops(principal),
}));
