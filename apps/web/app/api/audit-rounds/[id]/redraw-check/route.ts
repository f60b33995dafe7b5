// POST /api/audit-rounds/{id}/redraw-check – redraw the sample from the stored seed and lot and compare
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { redrawCheck } from '~/server/queries/audits';

export const POST = route(
  { permission: 'audits:read', params: idParams },
  async ({ principal, params }) => redrawCheck(principal, params.id),
);
