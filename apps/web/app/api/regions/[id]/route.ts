// PATCH /api/regions/{id} – rename a region or make a regional manager its manager (owner)
import { idParams } from '~/lib/validators/common';
import { regionPatch } from '~/lib/validators/shops';
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';
import { updateRegion } from '~/server/shops';

export const PATCH = route(
  { permission: 'settings:manage', params: idParams, body: regionPatch },
  async ({ principal, params, body }) => updateRegion(principal, params.id, body),
);

export const { DELETE, GET, POST, PUT, OPTIONS } = otherMethods(['PATCH']);
