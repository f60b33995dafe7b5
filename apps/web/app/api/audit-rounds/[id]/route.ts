// GET /api/audit-rounds/{id} – one round: plan, seed, lot, sample, scores, decision and follow-up
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { getRound } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'audits:read', params: idParams },
  async ({ principal, params }) => getRound(principal, params.id),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
