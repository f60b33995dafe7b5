// GET /api/network/comparison – per shop in scope: the counts, figures, intervals and bands of the period, with network totals
import { comparisonQuery } from '~/lib/validators/network';
import { route } from '~/server/api';
import { networkComparison } from '~/server/queries/network';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'network:read', query: comparisonQuery },
  async ({ principal, query }) => networkComparison(principal, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
