// GET /api/customers?query= – customers of the caller's shops matching a name, phone or e-mail, with their reels
import { customerSearchQuery } from '~/lib/validators/customers';
import { route } from '~/server/api';
import { searchCustomers } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'jobs:read', query: customerSearchQuery },
  async ({ principal, query }) => ({ customers: await searchCustomers(principal, query.query) }),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
