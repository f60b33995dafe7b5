// POST /api/jobs/{id}/bench-sessions – start or stop the caller's bench timer, or log minutes by hand
import { idParams } from '~/lib/validators/common';
import { benchSessionInput } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { recordBenchTime } from '~/server/bench/work';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const POST = route(
  { permission: 'jobs:write', params: idParams, body: benchSessionInput },
  async ({ principal, params, body }) => {
    await recordBenchTime(principal, params.id, body);
    return getJobDetail(principal, params.id);
  },
);

export const { DELETE, GET, PATCH, PUT, OPTIONS } = otherMethods(['POST']);
