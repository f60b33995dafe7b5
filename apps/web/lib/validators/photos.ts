import { z } from 'zod';
import { idNumber, text } from './common';

export const PHOTO_STAGES = ['check_in', 'teardown', 'reassembly'] as const;
export type PhotoStage = (typeof PHOTO_STAGES)[number];

export const PHOTO_STAGE_LABELS: Record<PhotoStage, string> = {
  check_in: 'At check-in',
  teardown: 'Teardown',
  reassembly: 'Reassembly',
};

export const PHOTO_MAX_BYTES = 10 * 1024 * 1024;
/** The kinds of image the bench accepts, as detected from the file's bytes. */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'];
export const PHOTO_TYPES_TEXT = 'JPEG, PNG, WebP or HEIC';

export const photoUploadRequest = z.strictObject({
  stage: z.enum(PHOTO_STAGES, { error: 'Choose check-in, teardown or reassembly' }),
  // What the browser says the file is; only a first filter, the bytes decide later.
  contentType: text()
    .max(100)
    .refine((t) => t === '' || t === 'application/octet-stream' || t.startsWith('image/'), {
      message: `Only photos can be uploaded (${PHOTO_TYPES_TEXT})`,
    }),
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

/**
 * POST /api/jobs/{id}/photos takes either a new upload or, with `confirm`, the confirmation of
 * one; the presence of `confirm` picks the schema so that field errors name the right fields.
 */
export const photoPostBody = z.custom<Record<string, unknown>>(
  (v) => typeof v === 'object' && v !== null && !Array.isArray(v),
  { message: 'Send a JSON object' },
);
export const isConfirm = (body: Record<string, unknown>) => 'confirm' in body;
