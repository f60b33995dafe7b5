// GET, PATCH /api/corrective-actions – corrective actions of the caller's shops; change one (id in the body)
import { correctiveActionListQuery, correctiveActionPatchWithId } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { updateCorrectiveAction } from '~/server/audits/corrective-actions';
import { listCorrectiveActions } from '~/server/queries/corrective-actions';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'corrective-actions:manage', query: correctiveActionListQuery },
  async ({ principal, query }) => ({
    correctiveActions: await listCorrectiveActions(principal, query),
  }),
);

export const PATCH = route(
  { permission: 'corrective-actions:manage', body: correctiveActionPatchWithId },
  async ({ principal, body }) => {
    const { id, ...patch } = body;
    return updateCorrectiveAction(principal, id, patch);
  },
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
