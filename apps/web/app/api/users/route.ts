// GET /api/users – every person in the network with role and scope (owner only)
import { route } from '~/server/api';
import { listPeople } from '~/server/queries/users';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'users:manage' }, async () => ({
  users: await listPeople(),
}));

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
