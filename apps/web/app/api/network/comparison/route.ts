// GET /api/network/comparison – per shop in scope: the counts, figures, intervals and bands of the period, with network totals
import { comparisonQuery } from '~/lib/validators/network';
import { route } from '~/server/api';
import { networkComparison } from '~/server/queries/network';

export const GET = route(
  { permission: 'network:read', query: comparisonQuery },
  async ({ principal, query }) => networkComparison(principal, query),
);
