// GET, PUT /api/audit-rounds/{id}/samples/{jobId} – a sampled job's record and answers; save the auditor's answers
import { roundSampleParams, sampleAnswersInput } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { deliverSoon } from '~/server/audits/deliver';
import { saveSample } from '~/server/audits/score';
import { getSample } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route(
  { permission: 'audits:read', params: roundSampleParams },
  async ({ principal, params }) => getSample(principal, params.id, params.jobId),
);

export const PUT = route(
  { permission: 'audits:score', params: roundSampleParams, body: sampleAnswersInput },
  async ({ principal, params, body }) => {
    const saved = await saveSample(principal, params.id, params.jobId, body);
    if (saved.correctiveActionId !== null) deliverSoon();
    return saved;
  },
);

export const { DELETE, PATCH, POST, OPTIONS } = otherMethods(['GET', 'PUT']);
