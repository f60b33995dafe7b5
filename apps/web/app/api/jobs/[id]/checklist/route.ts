// PUT /api/jobs/{id}/checklist – replace the job's ticked checklist steps ({ stepIds })
import { idParams } from '~/lib/validators/common';
import { checklistInput } from '~/lib/validators/jobs';
import { route } from '~/server/api';
import { setChecklist } from '~/server/bench/work';
import { getJobDetail } from '~/server/queries/bench';
import { otherMethods } from '~/server/method-not-allowed';

export const PUT = route(
  { permission: 'jobs:write', params: idParams, body: checklistInput },
  async ({ principal, params, body }) => {
    await setChecklist(principal, params.id, body);
    return getJobDetail(principal, params.id);
  },
);

export const { DELETE, GET, PATCH, POST, OPTIONS } = otherMethods(['PUT']);
