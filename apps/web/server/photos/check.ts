import { fileTypeFromBuffer } from 'file-type';
import { PHOTO_MAX_BYTES, PHOTO_TYPES, PHOTO_TYPES_TEXT } from '~/lib/validators/photos';

/** Enough of the file's start for every image signature file-type knows. */
export const SNIFF_BYTES = 4100;

export type PhotoCheck = { ok: true; contentType: string } | { ok: false; reason: string };

/**
 * Decides whether an uploaded object is a photo we keep, from its first bytes and its stored size
 * only: the file's name and the type the browser claimed are never trusted.
 */
export async function checkPhoto(firstBytes: Uint8Array, size: number): Promise<PhotoCheck> {
  if (size <= 0) return { ok: false, reason: 'The file is empty.' };
  if (size > PHOTO_MAX_BYTES) {
    const mb = (size / (1024 * 1024)).toFixed(1);
    return { ok: false, reason: `The photo is ${mb} MB; the limit is 10 MB.` };
  }
  const detected = await fileTypeFromBuffer(firstBytes);
  // A single HEIF image may carry the generic "mif1" brand; both are the camera's HEIC photos.
  if (detected && PHOTO_TYPES.includes(detected.mime)) {
    return { ok: true, contentType: detected.mime };
  }
  return {
    ok: false,
    reason: `This file is not a ${PHOTO_TYPES_TEXT} photo (its contents were checked, not its name)${
      detected ? `; it looks like ${detected.mime}` : ''
    }.`,
  };
}
