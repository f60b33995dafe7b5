// GET /api/me – the signed-in caller: id, name, role and scope
import { route } from '~/server/api';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'account:read' }, async ({ principal }) => ({
  id: principal.id,
  name: principal.name,
  email: principal.email,
  role: principal.role,
  scope: principal.scope,
}));

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
