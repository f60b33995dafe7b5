// GET, POST /api/shops – the shops the caller can see, with region, time zone and counts of open work; POST opens a shop (owner)
import { shopCreate } from '~/lib/validators/shops';
import { route } from '~/server/api';
import { listShops } from '~/server/queries/shops';
import { otherMethods } from '~/server/method-not-allowed';
import { openShop } from '~/server/shops';

export const GET = route({ permission: 'shops:read' }, async ({ principal }) => ({
  shops: await listShops(principal),
}));

export const POST = route(
  { permission: 'settings:manage', body: shopCreate },
  async ({ principal, body }) => {
    const shop = await openShop(principal, body);
    return Response.json(shop, { status: 201, headers: { location: `/api/shops/${shop.id}` } });
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
