// GET, POST /api/jobs/{id}/photos – the job's photos with view URLs; start an upload (presigned PUT) or confirm it
import {
  isConfirm,
  photoConfirmRequest,
  photoPostBody,
  photoUploadRequest,
} from '~/lib/validators/photos';
import { idParams } from '~/lib/validators/common';
import { route } from '~/server/api';
import { badRequest, fieldErrorsOf } from '~/server/errors';
import { confirmPhotoUpload, listPhotos, startPhotoUpload } from '~/server/photos/service';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';

export const GET = route(
  { permission: 'jobs:read', params: idParams },
  async ({ principal, params }) => listPhotos(principal, params.id),
);

/**
 * Two calls: `{ stage, contentType, size, fileName? }` → 201 `{ photoId, uploadUrl, headers }`;
 * the browser PUTs the file to `uploadUrl`; then `{ confirm: photoId }` → 200 with the photo, or
 * 400 when its bytes are not a JPEG, PNG, WebP or HEIC image or it is over 10 MB (then removed).
 */
export const POST = route(
  { permission: 'jobs:write', params: idParams, body: photoPostBody },
  async ({ principal, params, body }) => {
    if (isConfirm(body)) {
      const parsed = photoConfirmRequest.safeParse(body);
      if (!parsed.success)
        throw badRequest('Some body fields are not valid.', fieldErrorsOf(parsed.error, 'body'));
      return { photo: await confirmPhotoUpload(principal, params.id, parsed.data.confirm) };
    }
    const parsed = photoUploadRequest.safeParse(body);
    if (!parsed.success)
      throw badRequest('Some body fields are not valid.', fieldErrorsOf(parsed.error, 'body'));
    return Response.json(await startPhotoUpload(principal, params.id, parsed.data), {
      status: 201,
    });
  },
);

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
