// GET, POST /api/regions – the network's regions with their shop counts and managers; POST adds one (owner)
import { regionCreate } from '~/lib/validators/shops';
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';
import { createRegion, listRegions } from '~/server/shops';

export const GET = route({ permission: 'settings:manage' }, async () => ({
  regions: await listRegions(),
}));

export const POST = route(
  { permission: 'settings:manage', body: regionCreate },
  async ({ principal, body }) =>
    Response.json(await createRegion(principal, body), { status: 201 }),
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
