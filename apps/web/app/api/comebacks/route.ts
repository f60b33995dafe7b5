// GET /api/comebacks?shop=&status= – the review queues of the caller's shops: open ones oldest first, then reviewed ones
import { comebackListQuery } from '~/lib/validators/comebacks';
import { route } from '~/server/api';
import { listComebacks } from '~/server/queries/comebacks';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'comebacks:read', query: comebackListQuery },
  async ({ principal, query }) => listComebacks(principal, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
