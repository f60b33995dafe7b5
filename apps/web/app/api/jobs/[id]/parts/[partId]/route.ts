// DELETE /api/jobs/{id}/parts/{partId} – remove a part line from a job
import { partParams } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { deletePart } from '~/server/bench/work';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const DELETE = route(
  { permission: 'jobs:write', params: partParams },
  async ({ principal, params }) => {
    await deletePart(principal, params.id, params.partId);
    return getJobDetail(principal, params.id);
  },
);

export const { GET, PATCH, POST, PUT, OPTIONS } = otherMethods(['DELETE']);
