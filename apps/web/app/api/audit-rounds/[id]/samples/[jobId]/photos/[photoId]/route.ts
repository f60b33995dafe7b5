// GET /api/audit-rounds/{id}/samples/{jobId}/photos/{photoId} – a sampled job's photo, served as the bench's photo route serves it
import { samplePhotoParams } from '~/lib/validators/audits';
import { route } from '~/server/api';
import { photoResponse } from '~/server/photos/service';
import { requireSampledJob } from '~/server/queries/audits';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';

export const GET = route(
  { permission: 'audits:read', params: samplePhotoParams },
  async ({ principal, params }) => {
    await requireSampledJob(principal, params.id, params.jobId);
    return photoResponse(params.jobId, params.photoId);
  },
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
