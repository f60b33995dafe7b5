import { PHOTO_STAGES } from '@reelwright/db/values';
import { z } from 'zod';
import { DECLARED_PHOTO_TYPE, PHOTO_MAX_BYTES, PHOTO_TYPES_TEXT } from '../photos';
import { idNumber, idParam, text } from './common';

export * from '../photos';

export const photoUploadRequest = z.strictObject({
  stage: z.enum(PHOTO_STAGES, { error: 'Choose check-in, teardown or reassembly' }),
  // What the browser says the file is; only a first filter, the bytes decide later.
  contentType: z
    .string({ error: `Give the photo's type (${PHOTO_TYPES_TEXT})` })
    .regex(DECLARED_PHOTO_TYPE, `Only ${PHOTO_TYPES_TEXT} photos can be uploaded`),
  size: z
    .number({ error: 'Give the file size in bytes' })
    .int()
    .min(1, 'The file is empty')
    .max(PHOTO_MAX_BYTES, 'The photo is larger than 10 MB'),
  fileName: text().max(255).optional(),
});
export type PhotoUploadRequest = z.infer<typeof photoUploadRequest>;

export const photoConfirmRequest = z.strictObject({
  confirm: idNumber,
});

export const photoParams = z.object({ id: idParam, photoId: idParam });

/**
 * POST /api/jobs/{id}/photos takes either a new upload or, with `confirm`, the confirmation of
 * one; the presence of `confirm` picks the schema so that field errors name the right fields.
 */
export const photoPostBody = z.custom<Record<string, unknown>>(
  (v) => typeof v === 'object' && v !== null && !Array.isArray(v),
  { message: 'Send a JSON object' },
);
export const isConfirm = (body: Record<string, unknown>) => 'confirm' in body;
