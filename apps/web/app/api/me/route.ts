// GET /api/me – the signed-in caller: id, name, role and scope
import { route } from '~/server/api';

export const GET = route({ permission: 'account:read' }, async ({ principal }) => ({
  id: principal.id,
  name: principal.name,
  email: principal.email,
  role: principal.role,
  scope: principal.scope,
}));
