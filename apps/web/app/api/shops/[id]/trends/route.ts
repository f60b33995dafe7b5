// GET /api/shops/{id}/trends – one shop's monthly comeback estimates with their intervals (p-chart limits on final months), turnaround or revenue per bench hour (404 outside the scope)
import { idParams } from '~/lib/validators/common';
import { shopTrendsQuery } from '~/lib/validators/network';
import { route } from '~/server/api';
import { shopTrends } from '~/server/queries/network';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'shops:read', params: idParams, query: shopTrendsQuery },
  async ({ principal, params, query }) => shopTrends(principal, params.id, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
