// GET /api/shops/{id} – one shop in the caller's scope (404 outside it)
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { getShop } from '~/server/queries/shops';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'shops:read', params: idParams },
  async ({ principal, params }) => getShop(principal, params.id),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
