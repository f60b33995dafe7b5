// GET, PATCH /api/shops/{id} – one shop in the caller's scope (404 outside it); PATCH renames, moves, re-rates, closes or reopens it (owner)
import { idParams } from '~/lib/validators/common';
import { shopPatch } from '~/lib/validators/shops';
import { route } from '~/server/api';
import { getShop } from '~/server/queries/shops';
import { otherMethods } from '~/server/method-not-allowed';
import { updateShop } from '~/server/shops';

export const GET = route(
  { permission: 'shops:read', params: idParams },
  async ({ principal, params }) => getShop(principal, params.id),
);

export const PATCH = route(
  { permission: 'settings:manage', params: idParams, body: shopPatch },
  async ({ principal, params, body }) => updateShop(principal, params.id, body),
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
