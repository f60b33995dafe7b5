// POST /api/audit-rounds/{id}/redraw-check – redraw the sample from the stored seed and lot and compare
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { redrawCheck } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'audits:read', params: idParams },
  async ({ principal, params }) => redrawCheck(principal, params.id),
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
