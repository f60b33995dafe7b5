// GET /api/users – every person in the network with role and scope (owner only)
import { route } from '~/server/api';
import { listPeople } from '~/server/queries/users';

export const GET = route({ permission: 'users:manage' }, async () => ({
  users: await listPeople(),
}));
