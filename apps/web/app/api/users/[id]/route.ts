// GET, PATCH /api/users/{id} – one person with their invitation and history (404 outside the caller's view); PATCH changes name, role, scope or active (owner)
import { idParams } from '~/lib/validators/common';
import { personPatch } from '~/lib/validators/people';
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';
import { getPerson, updatePerson } from '~/server/people';

export const GET = route(
  { permission: 'people:read', params: idParams },
  async ({ principal, params }) => getPerson(principal, params.id),
);

export const PATCH = route(
  { permission: 'users:manage', params: idParams, body: personPatch },
  async ({ principal, params, body }) => updatePerson(principal, params.id, body),
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
