// GET /api/shops/{id}/metrics – one shop's figures for a period, judged against the network (404 outside the scope)
import { idParams } from '~/lib/validators/common';
import { periodQuery } from '~/lib/validators/network';
import { route } from '~/server/api';
import { shopMetrics } from '~/server/queries/network';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'shops:read', params: idParams, query: periodQuery },
  async ({ principal, params, query }) => shopMetrics(principal, params.id, query),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
