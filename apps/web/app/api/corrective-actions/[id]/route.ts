// GET, PATCH /api/corrective-actions/{id} – one corrective action; move it along, verify it or edit it
import { correctiveActionPatch } from '~/lib/validators/audits';
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { updateCorrectiveAction } from '~/server/audits/corrective-actions';
import { getCorrectiveAction } from '~/server/queries/corrective-actions';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'corrective-actions:manage', params: idParams },
  async ({ principal, params }) => getCorrectiveAction(principal, params.id),
);

export const PATCH = route(
  { permission: 'corrective-actions:manage', params: idParams, body: correctiveActionPatch },
  async ({ principal, params, body }) => updateCorrectiveAction(principal, params.id, body),
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
