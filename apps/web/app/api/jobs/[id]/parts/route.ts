// POST /api/jobs/{id}/parts – add a part line (name, part number, quantity, unit price) to a job
import { idParams } from '~/lib/validators/common';
import { partInput } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { addPart } from '~/server/bench/work';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'jobs:write', params: idParams, body: partInput },
  async ({ principal, params, body }) => {
    await addPart(principal, params.id, body);
    return Response.json(await getJobDetail(principal, params.id), { status: 201 });
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
