// The bench photos' stages and limits, free of zod, so that pages in the browser can use them;
// lib/validators/photos.ts builds the request schemas from them.
import { PHOTO_STAGES } from '@reelwright/db/values';

export { PHOTO_STAGES };
export type PhotoStage = (typeof PHOTO_STAGES)[number];

export const PHOTO_STAGE_LABELS: Record<PhotoStage, string> = {
  check_in: 'At check-in',
  teardown: 'Teardown',
  reassembly: 'Reassembly',
};

export const PHOTO_MAX_BYTES = 10 * 1024 * 1024;
/** The kinds of image the bench accepts: every browser shows them inline. */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;
export type PhotoType = (typeof PHOTO_TYPES)[number];
export const PHOTO_TYPES_TEXT = 'JPEG, PNG or WebP';

/**
 * The declared type, taken exactly: one of the three, any case, with no parameters, spaces or
 * line breaks (JS `$` never matches before a trailing newline). The bytes are checked again at
 * confirmation; this keeps anything else out of the signed upload headers.
 */
export const DECLARED_PHOTO_TYPE = /^image\/(?:jpeg|png|webp)$/i;
