// GET /api/jobs/{id}/photos/{photoId} – one checked photo's image, with its detected type, nosniff and a sandboxing policy
import { photoParams } from '~/lib/validators/photos';
import { route } from '~/server/api';
import { jobPhotoResponse } from '~/server/photos/service';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';

export const GET = route(
  { permission: 'jobs:read', params: photoParams },
  async ({ principal, params }) => jobPhotoResponse(principal, params.id, params.photoId),
);

export const { DELETE, PATCH, POST, PUT, OPTIONS } = otherMethods(['GET']);
