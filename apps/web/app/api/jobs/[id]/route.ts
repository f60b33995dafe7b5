// GET, PATCH /api/jobs/{id} – one job with its timeline, bench time, parts and checklist; edit its record and money
import { idParams } from '~/lib/validators/common';
import { jobPatch } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { patchJob } from '~/server/bench/jobs';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'jobs:read', params: idParams },
  async ({ principal, params }) => getJobDetail(principal, params.id),
);

export const PATCH = route(
  { permission: 'jobs:write', params: idParams, body: jobPatch },
  async ({ principal, params, body }) => {
    await patchJob(principal, params.id, body);
    return getJobDetail(principal, params.id);
  },
);

export const { DELETE, POST, PUT, OPTIONS } = otherMethods(['GET', 'PATCH']);
