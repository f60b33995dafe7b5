// GET, POST /api/audit-rounds – the audit rounds the caller sees; plan a round and draw its sample
import { planRoundInput, roundListQuery } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { deliverSoon } from '~/server/audits/deliver';
import { planRound } from '~/server/audits/plan';
import { listRounds } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'audits:read', query: roundListQuery },
  async ({ principal, query }) => ({ rounds: await listRounds(principal, query) }),
);

export const POST = route(
  { permission: 'audits:plan', body: planRoundInput },
  async ({ principal, body }) => {
    const round = await planRound(principal, body);
    deliverSoon();
    return Response.json(round, {
      status: 201,
      headers: { location: `/api/audit-rounds/${round.id}` },
    });
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
