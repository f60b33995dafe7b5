// GET /api/network/trends – monthly comeback estimates with their intervals (p-chart limits on final months), turnaround or revenue per bench hour for every shop in scope
import { networkTrendsQuery } from '~/lib/validators/network';
import { route } from '~/server/api';
import { networkTrends } from '~/server/queries/network';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'network:read', query: networkTrendsQuery },
  async ({ principal, query }) => networkTrends(principal, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
